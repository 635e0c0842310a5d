/** One page of a list a route handler answers in pages (`?page=&pageSize=`, 1-based). */
export interface PageOf<T> {
  items: T[];
  page: number;
  pageSize: number;
  total: number;
  /** At least 1, so an empty list still has a page 1 to show. */
  pages: number;
}

/** Page `page` (1-based) of `all`, `pageSize` items a page; a page past the end is empty. */
export function pageOf<T>(all: readonly T[], page: number, pageSize: number): PageOf<T> {
  const start = (page - 1) * pageSize;
  return {
    items: all.slice(start, start + pageSize),
    page,
    pageSize,
    total: all.length,
    pages: Math.max(1, Math.ceil(all.length / pageSize)),
  };
}
