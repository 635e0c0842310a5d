import './record.css';
import { DIFF_AREAS, type DiffSummary } from '@/simulator';
import { AREA_TITLES, changeText, outcomeText, verdictText, type RecordEvidence } from '@/lib/changeovers/record-text';
import type { Changeover, SignedRecord } from '@/lib/changeovers/types';
import { ROLE_LABELS } from '@/lib/roles';
import { formatDateTime } from '@/lib/format';
import { ChangeoverCaution } from './changeover-caution';

function Acceptance({ a }: { a: { reason: string; by: { name: string }; at: string } | null }) {
  if (!a) return null;
  return (
    <p className="mt-1 text-xs">
      <span className="font-semibold">Accepted</span> by {a.by.name}, {formatDateTime(a.at)}: “{a.reason}”
    </p>
  );
}

const th = 'border-b border-slate-400 px-2 py-1 text-left text-xs font-semibold uppercase tracking-wide text-slate-600';
const td = 'border-b border-slate-200 px-2 py-1 align-top';

/**
 * The signed record as a document: what it is, the caution, both versions with their SHA-256,
 * the diff summary, every verdict and check with its acceptance, and the two signatures. Reads
 * only the immutable record, plus (marked as coming after) a later rollback.
 */
export function SignedRecordView({ record, changeover }: { record: SignedRecord; changeover: Changeover }) {
  const summary = record.diffSummary as DiffSummary;
  const evidence = record.evidence as RecordEvidence;
  return (
    <article className="cw-record space-y-6 text-sm text-slate-900" data-testid="signed-record">
      <header className="space-y-1 border-b-2 border-slate-900 pb-3">
        <p className="text-xs uppercase tracking-widest text-slate-600">Cellwright · changeover record (rehearsal)</p>
        <h1 className="text-2xl font-semibold">{record.title}</h1>
        <p>
          Cell <span className="font-medium">{record.cellName}</span> · base <span className="font-mono">v{record.baseVersion}</span> → proposal{' '}
          <span className="font-mono">v{record.proposedVersion}</span>
        </p>
        <p className="font-mono text-xs text-slate-600">Record {record.changeoverId} · written {formatDateTime(record.createdAt)}</p>
      </header>

      <ChangeoverCaution />

      <section>
        <h2 className="mb-1 text-base font-semibold">What changes and why</h2>
        <p className="whitespace-pre-line">{record.description || '—'}</p>
      </section>

      <section>
        <h2 className="mb-1 text-base font-semibold">Versions</h2>
        <table className="w-full border-collapse">
          <thead>
            <tr>
              <th className={th}>Side</th>
              <th className={th}>Version</th>
              <th className={th}>SHA-256 of the document (canonical JSON)</th>
            </tr>
          </thead>
          <tbody>
            <tr>
              <td className={td}>Base (runs today)</td>
              <td className={`${td} font-mono`}>v{record.baseVersion}</td>
              <td className={`${td} break-all font-mono text-xs`} data-testid="base-sha256">
                {record.baseSha256}
              </td>
            </tr>
            <tr>
              <td className={td}>Proposal</td>
              <td className={`${td} font-mono`}>v{record.proposedVersion}</td>
              <td className={`${td} break-all font-mono text-xs`} data-testid="proposed-sha256">
                {record.proposedSha256}
              </td>
            </tr>
          </tbody>
        </table>
      </section>

      <section>
        <h2 className="mb-1 text-base font-semibold">What differs ({summary.total} changes)</h2>
        <table className="w-full border-collapse">
          <thead>
            <tr>
              <th className={th}>Area</th>
              <th className={th}>Added</th>
              <th className={th}>Removed</th>
              <th className={th}>Changed</th>
              <th className={th}>Reordered</th>
              <th className={th}>Moved (layout)</th>
            </tr>
          </thead>
          <tbody>
            {DIFF_AREAS.filter((a) => summary.areas[a].total > 0).map((a) => (
              <tr key={a}>
                <td className={td}>{AREA_TITLES[a]}</td>
                <td className={`${td} font-mono`}>{summary.areas[a].added}</td>
                <td className={`${td} font-mono`}>{summary.areas[a].removed}</td>
                <td className={`${td} font-mono`}>{summary.areas[a].changed}</td>
                <td className={`${td} font-mono`}>{summary.areas[a].reordered}</td>
                <td className={`${td} font-mono`}>{summary.areas[a].moved}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>

      <section>
        <h2 className="mb-1 text-base font-semibold">Interlock proofs{evidence.ranOn ? ` (v${evidence.ranOn.baseVersion} and v${evidence.ranOn.proposedVersion})` : ''}</h2>
        {evidence.proofs.length === 0 ? (
          <p>No interlock rules were proved.</p>
        ) : (
          <table className="w-full border-collapse">
            <thead>
              <tr>
                <th className={th}>Rule</th>
                <th className={th}>Base</th>
                <th className={th}>Proposal</th>
              </tr>
            </thead>
            <tbody>
              {evidence.proofs.map((p) => (
                <tr key={p.ruleId} data-testid="record-proof">
                  <td className={td}>
                    <p className="font-medium">{p.title || p.sentence}</p>
                    {p.title ? <p className="text-xs text-slate-700">{p.sentence}</p> : null}
                    <Acceptance a={p.acceptance} />
                  </td>
                  <td className={td}>
                    {verdictText(p.base)}
                    {p.base ? <p className="text-xs text-slate-600">{p.base.detail}</p> : null}
                  </td>
                  <td className={td}>
                    {verdictText(p.proposed)}
                    {p.proposed ? <p className="text-xs text-slate-600">{p.proposed.detail}</p> : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>

      <section>
        <h2 className="mb-1 text-base font-semibold">Scenario checks</h2>
        {evidence.checks.length === 0 ? (
          <p>The cell kept no scenarios.</p>
        ) : (
          <table className="w-full border-collapse">
            <thead>
              <tr>
                <th className={th}>Scenario</th>
                <th className={th}>Base</th>
                <th className={th}>Proposal</th>
              </tr>
            </thead>
            <tbody>
              {evidence.checks.map((c) => (
                <tr key={c.checkId} data-testid="record-check">
                  <td className={td}>
                    <p className="font-medium">{c.name}</p>
                    <p className="text-xs">{c.changed ? `Outcome changed: ${c.changes.map((x) => changeText(x)).join('; ')}` : 'Outcome unchanged'}</p>
                    <Acceptance a={c.acceptance} />
                  </td>
                  <td className={td}>{outcomeText(c.base)}</td>
                  <td className={td}>{outcomeText(c.proposed)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>

      <section data-keep>
        <h2 className="mb-1 text-base font-semibold">Signatures</h2>
        <div className="grid grid-cols-2 gap-6">
          <div className="border-t border-slate-900 pt-1" data-testid="record-signed-by">
            <p className="font-medium">{record.signedBy.name}</p>
            <p className="text-xs text-slate-700">signed {formatDateTime(record.signedAt)} · opened the changeover</p>
          </div>
          <div className="border-t border-slate-900 pt-1" data-testid="record-countersigned-by">
            <p className="font-medium">{record.countersignedBy.name}</p>
            <p className="text-xs text-slate-700">
              countersigned {formatDateTime(record.countersignedAt)} · {ROLE_LABELS[record.countersignedBy.role]}
            </p>
          </div>
        </div>
      </section>

      {changeover.state === 'rolled-back' ? (
        <section className="rounded border border-slate-400 p-3" data-testid="record-rollback">
          <h2 className="text-base font-semibold">After sign-off: rolled back</h2>
          <p>
            {changeover.rolledBackBy?.name} rolled the cell back on {formatDateTime(changeover.rolledBackAt)}: version{' '}
            <span className="font-mono">v{changeover.rollbackVersion}</span> is the base document again. (Recorded with the changeover; the signed record above is unchanged.)
          </p>
        </section>
      ) : null}

      <footer className="border-t border-slate-300 pt-2 text-xs text-slate-600">
        This record cannot be changed: the database refuses any update or deletion of a signed record. Compare the SHA-256 values above with the versions in
        Cellwright to confirm which documents were signed.
      </footer>
    </article>
  );
}
