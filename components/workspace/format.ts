/** Cell time as m:ss.mmm (hours added when needed) — a bench clock, not a date. */
export function formatCellTime(ms: number): string {
  const total = Math.max(0, Math.floor(ms));
  const h = Math.floor(total / 3_600_000);
  const m = Math.floor((total % 3_600_000) / 60_000);
  const s = Math.floor((total % 60_000) / 1000);
  const milli = total % 1000;
  const core = `${String(m).padStart(h > 0 ? 2 : 1, '0')}:${String(s).padStart(2, '0')}.${String(milli).padStart(3, '0')}`;
  return h > 0 ? `${h}:${core}` : core;
}

/** Run speed as shown on the strip. */
export function formatSpeed(speed: 1 | 10 | 'max'): string {
  return speed === 'max' ? 'max' : `×${speed}`;
}

/** Controller state names from the engine (kebab or camel case) as words. */
export function humanise(name: string): string {
  return name
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .replace(/[-_.]/g, ' ')
    .toLowerCase();
}
