/**
 * How every browser here launches Debian's Chromium: the Playwright suite
 * (playwright.config.ts) and the browser benchmarks (tests/bench/workspace-bench.ts).
 * The background-networking flags stop Chromium flooding the closed network with refused
 * connections (see /work/shared/TOOLCHAIN.md).
 */
export const CHROMIUM_EXECUTABLE = '/usr/bin/chromium';

export const CHROMIUM_ARGS: readonly string[] = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

/** Launch options for `chromium.launch` and Playwright's `use.launchOptions`. */
export const CHROMIUM_LAUNCH_OPTIONS = { executablePath: CHROMIUM_EXECUTABLE, args: [...CHROMIUM_ARGS] };
