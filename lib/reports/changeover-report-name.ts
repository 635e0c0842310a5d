import type { SignedRecord } from '@/lib/changeovers/types';

/** Latin letters that Unicode does not decompose into a base letter and a mark (common practice in file-name slugs). */
const PLAIN: Record<string, string> = { Ł: 'L', ł: 'l', Ø: 'O', ø: 'o', Đ: 'D', đ: 'd', ß: 'ss', Æ: 'AE', æ: 'ae', Œ: 'OE', œ: 'oe', Þ: 'Th', þ: 'th' };

/** The printed report's file name as a download offers it: ASCII only, from the cell name, both versions and the date. */
export function changeoverReportFileName(record: Pick<SignedRecord, 'cellName' | 'baseVersion' | 'proposedVersion' | 'countersignedAt'>): string {
  const cell = record.cellName
    .normalize('NFKD')
    .replace(/\p{M}/gu, '')
    .replace(/[ŁłØøĐđßÆæŒœÞþ]/g, (c) => PLAIN[c])
    .replace(/[^A-Za-z0-9_-]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60);
  return `changeover-${cell || 'cell'}-v${record.baseVersion}-v${record.proposedVersion}-${record.countersignedAt.slice(0, 10)}.pdf`;
}
