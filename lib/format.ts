/** Dates shown the same on server and client (UTC, ISO-like, minutes). */
export function formatDateTime(iso: string | null): string {
  if (!iso) return '—';
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
}
