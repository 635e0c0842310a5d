import { describe, expect, it } from 'vitest';
import { pageOf } from './paging';

// Page arithmetic of 1-based pages: items (page-1)*size .. page*size-1, ceil(total/size)
// pages (common practice).
describe('pageOf', () => {
  const all = Array.from({ length: 25 }, (_, i) => i);
  it('cuts the requested page', () => {
    expect(pageOf(all, 2, 10)).toEqual({ items: [10, 11, 12, 13, 14, 15, 16, 17, 18, 19], page: 2, pageSize: 10, total: 25, pages: 3 });
  });
  it('gives the short last page', () => {
    expect(pageOf(all, 3, 10).items).toEqual([20, 21, 22, 23, 24]);
  });
  it('gives an empty page past the end', () => {
    expect(pageOf(all, 4, 10)).toEqual({ items: [], page: 4, pageSize: 10, total: 25, pages: 3 });
  });
  it('counts one page for an empty list', () => {
    expect(pageOf([], 1, 50)).toEqual({ items: [], page: 1, pageSize: 50, total: 0, pages: 1 });
  });
});
