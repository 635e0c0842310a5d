import { DIFF_AREAS, type DiffSummary } from '@/simulator';
import { AREA_TITLES, changeText, outcomeText, verdictText, type RecordEvidence } from '@/lib/changeovers/record-text';
import type { SignedRecord } from '@/lib/changeovers/types';
import { ROLE_LABELS } from '@/lib/roles';
import { formatDateTime } from '@/lib/format';
import { CHANGEOVER_CAUTION_LINES, SAFETY_CAUTION_TEXT } from '@/lib/cautions';
import { createPdfWriter } from './pdf-writer';

/**
 * The printed changeover report: the signed record (db/changeovers.ts, never changed once
 * written) set as a PDF, with the same sections as the record page
 * (components/changeovers/signed-record.tsx) and the same cautions (lib/cautions.ts). Made from the record alone,
 * so it can be made again at any time and says the same; the same record prints to the same bytes.
 */

function acceptanceText(a: { reason: string; by: { name: string }; at: string } | null): string {
  return a ? `\nAccepted by ${a.by.name}, ${formatDateTime(a.at)}: “${a.reason}”` : '';
}

/** Renders the signed record as a PDF (A4, Inter embedded). */
export async function renderChangeoverReport(record: SignedRecord): Promise<Uint8Array> {
  const summary = record.diffSummary as DiffSummary;
  const evidence = record.evidence as RecordEvidence;
  const w = await createPdfWriter({
    title: `Changeover record: ${record.title}`,
    subject: `Cell ${record.cellName}, version ${record.baseVersion} to ${record.proposedVersion}`,
    date: new Date(record.countersignedAt),
  });

  w.paragraph('CELLWRIGHT · CHANGEOVER RECORD (REHEARSAL)', { size: 8, muted: true });
  w.heading(record.title, 1);
  w.paragraph(`Cell ${record.cellName} · base v${record.baseVersion}, proposal v${record.proposedVersion}`);
  w.paragraph(`Record ${record.changeoverId} · written ${formatDateTime(record.createdAt)}`, { size: 8, muted: true });
  w.rule();

  w.heading('Training model — not a safety function');
  w.paragraph(SAFETY_CAUTION_TEXT, { size: 9 });
  w.bullets(CHANGEOVER_CAUTION_LINES, { size: 9 });

  w.heading('What changes and why');
  w.paragraph(record.description || '—');

  w.heading('Versions');
  w.table(
    [
      { title: 'Side', share: 1.3 },
      { title: 'Version', share: 0.7 },
      { title: 'SHA-256 of the document (canonical JSON)', share: 4 },
    ],
    [
      ['Base (runs today)', `v${record.baseVersion}`, record.baseSha256],
      ['Proposal', `v${record.proposedVersion}`, record.proposedSha256],
    ],
  );

  w.heading(`What differs (${summary.total} changes)`);
  const areas = DIFF_AREAS.filter((a) => summary.areas[a].total > 0);
  if (areas.length === 0) w.paragraph('No differences.');
  else
    w.table(
      [
        { title: 'Area', share: 2.4 },
        { title: 'Added', share: 1 },
        { title: 'Removed', share: 1 },
        { title: 'Changed', share: 1 },
        { title: 'Reordered', share: 1 },
        { title: 'Moved (layout)', share: 1.2 },
      ],
      areas.map((a) => {
        const s = summary.areas[a];
        return [AREA_TITLES[a], String(s.added), String(s.removed), String(s.changed), String(s.reordered), String(s.moved)];
      }),
    );

  w.heading(`Interlock proofs${evidence.ranOn ? ` (v${evidence.ranOn.baseVersion} and v${evidence.ranOn.proposedVersion})` : ''}`);
  if (evidence.proofs.length === 0) w.paragraph('No interlock rules were proved.');
  else
    w.table(
      [
        { title: 'Rule', share: 2.2 },
        { title: 'Base', share: 1.4 },
        { title: 'Proposal', share: 1.4 },
      ],
      evidence.proofs.map((p) => [`${p.title || p.sentence}${p.title ? `\n${p.sentence}` : ''}${acceptanceText(p.acceptance)}`, verdictText(p.base, true), verdictText(p.proposed, true)]),
    );

  w.heading('Scenario checks');
  if (evidence.checks.length === 0) w.paragraph('The cell kept no scenarios.');
  else
    w.table(
      [
        { title: 'Scenario', share: 2.2 },
        { title: 'Base', share: 1.4 },
        { title: 'Proposal', share: 1.4 },
      ],
      evidence.checks.map((c) => [
        `${c.name}\n${c.changed ? `Outcome changed: ${c.changes.map((x) => changeText(x, 'to')).join('; ')}` : 'Outcome unchanged'}${acceptanceText(c.acceptance)}`,
        outcomeText(c.base),
        outcomeText(c.proposed),
      ]),
    );

  w.heading('Signatures');
  w.table(
    [
      { title: 'Signed by', share: 1 },
      { title: 'Countersigned by', share: 1 },
    ],
    [
      [
        `${record.signedBy.name}\nsigned ${formatDateTime(record.signedAt)} · opened the changeover`,
        `${record.countersignedBy.name}\ncountersigned ${formatDateTime(record.countersignedAt)} · ${ROLE_LABELS[record.countersignedBy.role]}`,
      ],
    ],
    { size: 10 },
  );

  w.paragraph(
    'This record cannot be changed: the database refuses any update or deletion of a signed record. Compare the SHA-256 values above with the versions in Cellwright to confirm which documents were signed.',
    { size: 8, muted: true },
  );
  return w.finish((page, pages) => `Changeover record ${record.changeoverId} · page ${page} of ${pages}`);
}
