/** A file-name stem from a cell name: lower-case letters, digits and dashes only (safe in a header). */
export function downloadName(name: string): string {
  const stem = name
    .normalize('NFKD')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60);
  return stem || 'cell';
}
