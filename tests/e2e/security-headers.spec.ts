import { expect, test } from '@playwright/test';
import type { Page, Response } from '@playwright/test';
import { openArea, sharedDemoCellId, signIn, STUDENT } from './workspace-helpers';

/*
 * The Content-Security-Policy and the other security headers on the real app (hardening issue
 * #9, point 8): every page a student goes through — sign-in, dashboard, a cell workspace with
 * the engine's Web Worker and the logic canvas, a run and its replay — loads with no CSP
 * violation and no console error, and carries the headers. Also checked as a user would:
 * a foreign callback URL after sign-in, and a copied session cookie after sign-out.
 */

interface Violation {
  page: string;
  directive: string;
  blocked: string;
  sample: string;
}

/** Record every CSP violation any document of the page reports, and every console error. */
async function watch(page: Page): Promise<{ violations: Violation[]; consoleErrors: string[] }> {
  const consoleErrors: string[] = [];
  const violations: Violation[] = [];
  page.on('console', (msg) => {
    if (msg.type() === 'error') consoleErrors.push(msg.text());
  });
  page.on('pageerror', (err) => consoleErrors.push(`pageerror: ${err.message}`));
  // Name what failed to load: the console only says "Failed to load resource".
  page.on('response', (res) => {
    if (res.status() >= 400) consoleErrors.push(`${res.status()} ${new URL(res.url()).pathname}`);
  });
  // Reported to the test as they happen, so violations of earlier documents are kept across navigations.
  await page.exposeFunction('reportCspViolation', (v: Violation) => violations.push(v));
  await page.addInitScript(() => {
    const report = (window as unknown as { reportCspViolation: (v: unknown) => void }).reportCspViolation;
    document.addEventListener('securitypolicyviolation', (e) => {
      report({ page: location.pathname, directive: e.violatedDirective, blocked: e.blockedURI, sample: e.sample });
    });
  });
  return { consoleErrors, violations };
}

function cspOf(res: Response | null): Map<string, string> {
  const csp = res?.headers()['content-security-policy'] ?? '';
  return new Map(
    csp
      .split(';')
      .map((d) => d.trim())
      .filter(Boolean)
      .map((d) => [d.split(' ')[0], d.slice(d.indexOf(' ') + 1)] as [string, string]),
  );
}

function expectPageHeaders(res: Response | null, { referrerPolicy = 'same-origin', signedIn = true } = {}) {
  expect(res, 'a document response').not.toBeNull();
  const headers = res!.headers();
  const csp = cspOf(res);
  expect(csp.get('script-src')).toMatch(/'nonce-[^']+' 'strict-dynamic'/);
  // Eval only where the engine may run on the main thread: a signed-in visitor's pages.
  if (signedIn) expect(csp.get('script-src')).toContain("'unsafe-eval'");
  else expect(csp.get('script-src')).not.toContain('unsafe-eval');
  expect(csp.get('frame-ancestors')).toBe("'none'");
  expect(csp.get('object-src')).toBe("'none'");
  expect(csp.get('base-uri')).toBe("'self'");
  expect(csp.get('worker-src')).toBe("'self' blob:");
  expect(headers['x-content-type-options']).toBe('nosniff');
  expect(headers['x-frame-options']).toBe('DENY');
  expect(headers['referrer-policy']).toBe(referrerPolicy);
  // NEXTAUTH_URL is plain http in the tests: no HSTS.
  expect(headers['strict-transport-security']).toBeUndefined();
}

test('every page a student opens passes the CSP with no console error, and carries the headers', async ({ page }) => {
  test.setTimeout(120_000);
  const seen = await watch(page);

  // Sign-in, with a callback URL that tries to leave the site: the app stays on its own origin.
  const signInPage = await page.goto('/sign-in?callbackUrl=%2F%5Cevil.example%2Fsteal');
  expectPageHeaders(signInPage, { signedIn: false });
  const nonceA = /'nonce-([^']+)'/.exec(signInPage!.headers()['content-security-policy'])?.[1];
  await page.getByLabel('E-mail').fill(STUDENT.email);
  await page.getByLabel('Password').fill(STUDENT.password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((url) => url.pathname === '/dashboard');
  expect(new URL(page.url()).origin).toBe(new URL(signInPage!.url()).origin);

  // Dashboard: a fresh nonce per response.
  const dashboard = await page.goto('/dashboard');
  expectPageHeaders(dashboard);
  expect(/'nonce-([^']+)'/.exec(dashboard!.headers()['content-security-policy'])?.[1]).not.toBe(nonceA);
  await expect(page.getByRole('navigation', { name: 'Main' })).toBeVisible();

  // A cell workspace: the engine starts in its Web Worker, the logic canvas draws.
  const cellId = await sharedDemoCellId(page);
  const workspace = await page.goto(`/cells/${cellId}`);
  expectPageHeaders(workspace);
  await expect(page.getByTestId('engine-status')).toHaveText('ready');
  await openArea(page, 'Logic');
  await expect(page.getByTestId('logic-canvas')).toBeVisible();
  await expect(page.getByTestId('logic-canvas').locator('.react-flow__node').first()).toBeVisible();
  await page.getByRole('button', { name: 'Run ×1', exact: true }).click();
  await expect(page.getByTestId('run-speed')).toHaveText('×1');

  // A run: its result page and its replay (the demo student has graded attempts).
  const runs = await page.goto('/runs');
  expectPageHeaders(runs);
  const replayLink = page.getByTestId('drill-runs-table').getByRole('link', { name: 'Replay' }).first();
  const replayHref = await replayLink.getAttribute('href');
  const runId = /^\/runs\/([^/]+)\/replay$/.exec(replayHref ?? '')?.[1];
  expect(runId, 'a run with a replay').toBeTruthy();
  expectPageHeaders(await page.goto(`/runs/${runId}`));
  const replay = await page.goto(`/runs/${runId}/replay`);
  expectPageHeaders(replay);
  await expect(page.getByTestId('replay')).toBeVisible();

  // API responses: same frame and sniffing rules, and nothing to render.
  const api = await page.request.get('/api/runs');
  expect(api.status()).toBe(200);
  expect(api.headers()['x-content-type-options']).toBe('nosniff');
  expect(api.headers()['x-frame-options']).toBe('DENY');
  expect(api.headers()['content-security-policy']).toBe("default-src 'none'; frame-ancestors 'none'");

  expect(seen.violations).toEqual([]);
  expect(seen.consoleErrors.filter((m) => /Content Security Policy|Refused to/i.test(m))).toEqual([]);
  expect(seen.consoleErrors).toEqual([]);
});

test('token pages send no Referer and still pass the CSP', async ({ page }) => {
  const seen = await watch(page);
  for (const path of ['/reset-password/not-a-real-token-0123456789', '/invite/not-a-real-token-0123456789']) {
    const res = await page.goto(path);
    expectPageHeaders(res, { referrerPolicy: 'no-referrer', signedIn: false });
    await expect(page.getByRole('heading').first()).toBeVisible();
  }
  expect(seen.violations).toEqual([]);
  expect(seen.consoleErrors).toEqual([]);
});

test('signing out ends the session: a copy of its cookie is refused afterwards', async ({ page, browser }) => {
  await signIn(page, STUDENT);
  const cookies = await page.context().cookies();
  const session = cookies.find((c) => c.name === 'next-auth.session-token');
  expect(session, 'a session cookie').toBeTruthy();

  // A second browser holding a copy of the cookie works while the session is open.
  const copy = await browser.newContext();
  await copy.addCookies([session!]);
  expect((await copy.request.get('/api/runs')).status()).toBe(200);

  await page.getByRole('button', { name: 'Sign out' }).click();
  await page.waitForURL((url) => url.pathname === '/');
  expect((await copy.request.get('/api/runs')).status()).toBe(401);
  await copy.close();

  // Signing in again opens a new, working session.
  await signIn(page, STUDENT);
  expect((await page.request.get('/api/runs')).status()).toBe(200);
});

test('the policy is enforced, and the watcher above sees a violation', async ({ page }) => {
  const seen = await watch(page);
  // What a stored or reflected XSS would amount to: an inline script without the nonce in the
  // page's own HTML, served with the page's own headers.
  await page.route('**/sign-in', async (route) => {
    const res = await route.fetch();
    const html = (await res.text()).replace('</head>', '<script>window.injectedRan = true</script></head>');
    await route.fulfill({ response: res, body: html });
  });
  await page.goto('/sign-in');
  await expect(page.getByRole('button', { name: 'Sign in' })).toBeVisible();
  expect(await page.evaluate(() => (window as unknown as { injectedRan?: boolean }).injectedRan === true)).toBe(false);
  await expect.poll(() => seen.violations.map((v) => v.directive)).toContain('script-src-elem');
});
