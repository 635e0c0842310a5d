import { PDFDict, PDFDocument, PDFName } from 'pdf-lib';
import { describe, expect, it } from 'vitest';
import type { SignedRecord } from '@/lib/changeovers/types';
import { changeoverReportFileName } from './changeover-report-name';
import { renderChangeoverReport } from './changeover-report';

const areas = (over: Record<string, Partial<Record<'added' | 'removed' | 'changed', number>>>) =>
  Object.fromEntries(
    ['cell', 'devices', 'modules', 'wiring', 'pointMap', 'logic', 'routine', 'handshake'].map((a) => {
      const s = { added: 0, removed: 0, changed: 0, reordered: 0, moved: 0, ...(over[a] ?? {}) };
      return [a, { ...s, total: s.added + s.removed + s.changed }];
    }),
  );

// Fictional people and places; the names reach outside WinAnsi on purpose (Ł, Ω, Ж, an emoji).
const record: SignedRecord = {
  changeoverId: '5b0f6c1e-1111-4222-8333-944455556666',
  cellId: '6c1f7d2a-2222-4333-8444-a55566667777',
  cellName: 'Harrowgate press line — Łęczna bay',
  title: 'Coded guard switch on door 2 (Ωmega kit, Жанна’s list)',
  description: 'Replace the plain door switch with a coded one. 🙂 '.repeat(30),
  baseVersion: 3,
  proposedVersion: 5,
  baseSha256: 'a'.repeat(64),
  proposedSha256: 'b'.repeat(64),
  diffSummary: { total: 3, areas: areas({ devices: { added: 1, removed: 1 }, wiring: { changed: 1 } }) },
  evidence: {
    ranOn: { baseVersion: 3, proposedVersion: 5 },
    proofs: Array.from({ length: 30 }, (_, i) => ({
      ruleId: `r${i}`,
      title: `Door ${i} closed before motion`,
      sentence: 'Whenever the arm moves, the door switch reads closed.',
      base: { verdictId: `b${i}`, version: 3, status: 'proved', exact: true, timers: 'none', detail: 'induction, depth 4' },
      proposed: { verdictId: `p${i}`, version: 5, status: i === 2 ? 'violated' : 'proved', exact: true, timers: 'none', detail: 'scan 12' },
      acceptance: i === 2 ? { reason: 'Door locked out during the change.', by: { id: 'x', name: 'Zoë Marlowe' }, at: '2026-12-01T10:00:00.000Z' } : null,
    })),
    checks: [],
  },
  signedBy: { id: 'u1', name: 'Łukasz Brennan' },
  signedAt: '2026-12-02T09:00:00.000Z',
  countersignedBy: { id: 'u2', name: 'Ines Varga', role: 'lead' },
  countersignedAt: '2026-12-02T10:30:00.000Z',
  createdAt: '2026-12-02T10:30:00.000Z',
};

describe('the printed changeover report', () => {
  it('prints any name (embedded Inter faces), breaks pages, and gives the same bytes for the same record', async () => {
    const bytes = Buffer.from(await renderChangeoverReport(record));
    expect(Buffer.from(await renderChangeoverReport(record)).equals(bytes)).toBe(true);
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const pdf = await PDFDocument.load(bytes);
    // Thirty proof rows do not fit one A4 page with the rest.
    expect(pdf.getPageCount()).toBeGreaterThan(1);
    expect(pdf.getTitle()).toBe(`Changeover record: ${record.title}`);
    const used = new Set<string>();
    for (const page of pdf.getPages()) {
      const fonts = page.node.Resources()!.lookup(PDFName.of('Font'), PDFDict);
      for (const ref of fonts.values()) used.add(String(pdf.context.lookup(ref, PDFDict).get(PDFName.of('BaseFont'))));
    }
    // Latin, Latin Extended (Ł, ę in the names), Greek (Ω) and Cyrillic (Ж, both in the bold title) faces set text.
    expect([...used].sort()).toEqual(['/CWCYBX+Inter-Bold', '/CWGRBX+Inter-Bold', '/CWLABX+Inter-Bold', '/CWLARX+Inter-Regular', '/CWLERX+Inter-Regular']);
  });

  it('names the file in ASCII from the cell, the versions and the date', () => {
    expect(changeoverReportFileName(record)).toBe('changeover-Harrowgate-press-line-Leczna-bay-v3-v5-2026-12-02.pdf');
  });
});
