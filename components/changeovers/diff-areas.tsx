import type { CellDiff, DiffArea, DiffEntry } from '@/simulator';
import { DIFF_AREAS } from '@/simulator';
import { AREA_TITLES } from '@/lib/changeovers/record-text';
import { sideLines, targetLabel } from './diff-format';
import { KindBadge } from './diff-kind-icon';

/** Counts per area: a row of chips that jump to each area's section. */
export function DiffSummaryChips({ diff }: { diff: CellDiff }) {
  if (diff.summary.identical) return <p className="text-sm text-slate-600">The proposal is identical to the base: nothing changes yet.</p>;
  return (
    <ul className="flex flex-wrap gap-2" aria-label="Changes per area" data-testid="diff-summary">
      {DIFF_AREAS.filter((a) => diff.summary.areas[a].total > 0).map((a) => {
        const c = diff.summary.areas[a];
        const parts = (['added', 'removed', 'changed', 'reordered', 'moved'] as const).filter((k) => c[k] > 0).map((k) => `${c[k]} ${k}`);
        return (
          <li key={a}>
            <a href={`#diff-${a}`} className="inline-flex items-center gap-2 rounded-md border border-slate-200 bg-white px-2.5 py-1 text-sm hover:border-accent-400 hover:bg-accent-50">
              <span className="font-medium text-slate-800">{AREA_TITLES[a]}</span>
              <span className="text-xs text-slate-600">{parts.join(' · ')}</span>
            </a>
          </li>
        );
      })}
    </ul>
  );
}

function SideCell({ lines, side, kind }: { lines: string[]; side: 'base' | 'proposed'; kind: DiffEntry['kind'] }) {
  if (lines.length === 0) {
    return <span className="text-xs italic text-slate-600">{side === 'base' ? 'not in the base' : kind === 'removed' ? 'removed' : '—'}</span>;
  }
  return (
    <ul className="space-y-0.5">
      {lines.map((l, i) => (
        <li key={i} className="break-words font-mono text-xs text-slate-800">
          {l}
        </li>
      ))}
    </ul>
  );
}

function EntryRow({ entry }: { entry: DiffEntry }) {
  return (
    <tr data-testid="diff-entry" data-area={entry.area} data-kind={entry.kind} data-id={entry.id} className="align-top">
      <td className="py-2 pr-3">
        <KindBadge entry={entry} />
      </td>
      <td className="px-3 py-2">
        <p className="text-xs text-slate-500">
          {targetLabel(entry.target)} <span className="font-mono text-slate-800">{entry.id}</span>
          {entry.map ? (
            <span className="ml-1 rounded border border-slate-300 px-1 text-[10px] uppercase tracking-wide text-slate-600" title={entry.map === 'staged' ? 'Takes effect at the next controller restart' : 'The map in use'}>
              {entry.map === 'staged' ? 'staged — after restart' : 'live map'}
            </span>
          ) : null}
        </p>
        <p className="mt-0.5 text-sm text-slate-800">{entry.detail}</p>
      </td>
      <td className="bg-slate-50/60 px-3 py-2">
        <SideCell lines={sideLines(entry, 'base')} side="base" kind={entry.kind} />
      </td>
      <td className="px-3 py-2">
        <SideCell lines={sideLines(entry, 'proposed')} side="proposed" kind={entry.kind} />
      </td>
    </tr>
  );
}

/** The entries of one area as a table: kind, the thing in words, then base and proposed side by side. */
export function DiffAreaTable({ area, entries, baseVersion, proposedVersion }: { area: DiffArea; entries: DiffEntry[]; baseVersion: number; proposedVersion: number }) {
  const main = entries.filter((e) => e.importance === 'high');
  const layout = entries.filter((e) => e.importance === 'low');
  const head = (
    <thead className="text-xs uppercase tracking-wide text-slate-500">
      <tr>
        <th scope="col" className="w-36 py-1 pr-3">
          Change
        </th>
        <th scope="col" className="px-3 py-1">
          What
        </th>
        <th scope="col" className="w-1/4 bg-slate-50/60 px-3 py-1">
          Base <span className="font-mono normal-case">v{baseVersion}</span>
        </th>
        <th scope="col" className="w-1/4 px-3 py-1">
          Proposed <span className="font-mono normal-case">v{proposedVersion}</span>
        </th>
      </tr>
    </thead>
  );
  return (
    <section id={`diff-${area}`} aria-labelledby={`diff-${area}-title`} className="scroll-mt-6" data-testid={`diff-area-${area}`}>
      <h3 id={`diff-${area}-title`} className="mb-1 text-sm font-semibold text-slate-900">
        {AREA_TITLES[area]} <span className="font-normal text-slate-500">— {entries.length} change{entries.length === 1 ? '' : 's'}</span>
      </h3>
      {main.length > 0 ? (
        <div className="relative overflow-x-auto">
          <table className="w-full text-left text-sm">
            {head}
            <tbody className="divide-y divide-slate-100">
              {main.map((e) => (
                <EntryRow key={`${e.target}:${e.id}`} entry={e} />
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      {layout.length > 0 ? (
        <details className="mt-1 text-sm">
          <summary className="cursor-pointer text-slate-600">
            {layout.length} layout move{layout.length === 1 ? '' : 's'} (position only, nothing the cell does changes)
          </summary>
          <table className="mt-1 w-full text-left text-sm">
            {head}
            <tbody className="divide-y divide-slate-100">
              {layout.map((e) => (
                <EntryRow key={`${e.target}:${e.id}`} entry={e} />
              ))}
            </tbody>
          </table>
        </details>
      ) : null}
    </section>
  );
}

/** Every area but the logic sheet (which the canvas section shows), in the reviewer's order. */
export function DiffAreas({ diff, baseVersion, proposedVersion, skip = [] }: { diff: CellDiff; baseVersion: number; proposedVersion: number; skip?: DiffArea[] }) {
  const areas = DIFF_AREAS.filter((a) => !skip.includes(a) && diff.areas[a].length > 0);
  if (areas.length === 0) return null;
  return (
    <div className="space-y-6">
      {areas.map((a) => (
        <DiffAreaTable key={a} area={a} entries={diff.areas[a]} baseVersion={baseVersion} proposedVersion={proposedVersion} />
      ))}
    </div>
  );
}
