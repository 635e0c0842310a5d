/** A fresh id not used by any item of the document (`pb1`, `pb2`, …): panel devices, wiring rows, point-map ranges. */
export function freshId(prefix: string, taken: Iterable<string>): string {
  const used = new Set(taken);
  for (let i = 1; ; i++) if (!used.has(`${prefix}${i}`)) return `${prefix}${i}`;
}
