/**
 * Helpers every benchmark file shares: finding the running app to measure, and the median
 * the figures are reported as.
 */

export type BenchTarget = { ok: true; base: string } | { ok: false; reason: string };

/** The app to measure (BENCH_BASE_URL, answering /api/health), or a reason to skip. */
export async function reachableBase(): Promise<BenchTarget> {
  const base = process.env.BENCH_BASE_URL?.replace(/\/$/, '');
  if (!base) return { ok: false, reason: 'BENCH_BASE_URL is not set (e.g. http://127.0.0.1:3000 after `bash scripts/start.sh`)' };
  try {
    const r = await fetch(`${base}/api/health`, { signal: AbortSignal.timeout(5000) });
    if (!r.ok) return { ok: false, reason: `${base}/api/health answered ${r.status}` };
  } catch (e) {
    return { ok: false, reason: `${base} is not reachable (${(e as Error).message})` };
  }
  return { ok: true, base };
}

/** The middle value (the upper middle for an even count), robust to one slow outlier. */
export function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[s.length >> 1];
}
