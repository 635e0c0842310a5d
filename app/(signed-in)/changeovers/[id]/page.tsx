import type { Metadata } from 'next';
import Link from 'next/link';
import { Braces, FileSpreadsheet, FileText } from 'lucide-react';
import { Card, PageHeader } from '@/components/ui/card';
import { Refused } from '@/components/ui/refused';
import { formatDateTime } from '@/lib/format';
import { ChangeoverCaution } from '@/components/changeovers/changeover-caution';
import { ChangeoverHistory } from '@/components/changeovers/history';
import { ChangeoverPanel } from '@/components/changeovers/changeover-panel';
import { ChangeoverText } from '@/components/changeovers/changeover-text';
import { ChecksSection } from '@/components/changeovers/checks-section';
import { DiffAreas, DiffSummaryChips } from '@/components/changeovers/diff-areas';
import { LogicDiff } from '@/components/changeovers/logic-diff';
import { ProofsSection } from '@/components/changeovers/proofs-section';
import { StateBadge } from '@/components/changeovers/state-badge';
import { requirePageUser } from '@/lib/auth/session';
import { changeoverAbilities, changeoverForReader } from '@/lib/changeovers/access';
import { changeoverDiff } from '@/lib/changeovers/diff';
import { loadOrNotFound, paramsOrNotFound } from '@/lib/pages/not-found';
import { changeoverIdParamSchema } from '@/lib/schemas/changeovers';
import { listChangeoverEvents, listCountersignerCandidates } from '@/db/changeovers';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Changeover · Cellwright' };

const linkButton =
  'inline-flex items-center gap-2 rounded-md border border-slate-300 bg-white px-3 py-2 text-sm font-medium text-slate-800 hover:bg-slate-100';

/**
 * One changeover: what changes and why, where it stands and what to do next, the evidence
 * (proofs and scenario checks), the diff area by area with the logic sheet on a marked canvas,
 * and its history. Readers: the opener, the person asked to countersign, the admin.
 */
export default async function ChangeoverPage({ params }: { params: Promise<{ id: string }> }) {
  const raw = await params;
  const { user, allowed } = await requirePageUser(`/changeovers/${raw.id}`, ROLE_TABLE.changeovers);
  if (!allowed) return <Refused role={user.role} needs="maintenance leads, trainers and administrators" />;
  const { id } = paramsOrNotFound(changeoverIdParamSchema, raw);
  const co = await loadOrNotFound(changeoverForReader(user, id));
  const abilities = changeoverAbilities(user, co);
  const [{ diff, base, proposed, baseVersion, proposedVersion }, events, candidates] = await Promise.all([
    changeoverDiff(co),
    listChangeoverEvents(co.id),
    abilities.edit ? listCountersignerCandidates(user.id) : Promise.resolve([]),
  ]);
  const following = co.pinnedVersion === null && co.state === 'drafting';

  return (
    <>
      <PageHeader
        title={co.title}
        description={`Changeover on ${co.cellName} · opened by ${co.openedBy.name} on ${formatDateTime(co.createdAt)}`}
        actions={<StateBadge changeover={co} className="px-3 py-1 text-sm" />}
      />
      <div className="space-y-6">
        <ChangeoverCaution />

        <nav aria-label="On this page" className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
          {[
            ['#status', 'Status and sign-off'],
            ['#evidence', 'Proofs and checks'],
            ['#diff', 'What differs'],
            ['#logic', 'Logic sheet'],
            ['#history', 'History'],
          ].map(([href, label]) => (
            <a key={href} href={href} className="text-accent-700 hover:underline">
              {label}
            </a>
          ))}
        </nav>

        <div className="grid gap-6 lg:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
          <Card title="What changes and why">
            <ChangeoverText id={co.id} title={co.title} description={co.description} canEdit={abilities.edit && (co.state === 'drafting' || co.state === 'checked')} />
            <dl className="mt-4 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
              <dt className="text-slate-500">Cell</dt>
              <dd>
                {co.cellActive ? (
                  <Link href={`/cells/${co.cellId}`} className="text-accent-700 hover:underline">
                    {co.cellName}
                  </Link>
                ) : (
                  `${co.cellName} (deleted)`
                )}
              </dd>
              <dt className="text-slate-500">Base</dt>
              <dd className="font-mono">v{co.baseVersion}</dd>
              <dt className="text-slate-500">Proposal</dt>
              <dd>
                <span className="font-mono">v{proposedVersion}</span> {following ? <span className="text-slate-500">(the latest, while drafting)</span> : <span className="text-slate-500">(pinned)</span>}
              </dd>
              <dt className="text-slate-500">Countersigner</dt>
              <dd>{co.countersigner?.name ?? <span className="text-slate-500">not named yet</span>}</dd>
            </dl>
          </Card>
          <section id="status" className="scroll-mt-6">
            <Card title="Status and sign-off">
              <ChangeoverPanel changeover={co} abilities={abilities} me={{ id: user.id, name: user.name }} candidates={candidates} />
            </Card>
          </section>
        </div>

        <section id="evidence" className="scroll-mt-6 space-y-6">
          {/* The evidence sections title themselves (components/changeovers/proofs-section.tsx, checks-section.tsx). */}
          <div className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm">
            <ProofsSection changeoverId={co.id} cellId={co.cellId} canEdit={abilities.edit} />
          </div>
          <div className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm">
            <ChecksSection changeoverId={co.id} cellId={co.cellId} canEdit={abilities.edit} />
          </div>
        </section>

        <section id="diff" className="scroll-mt-6">
          <Card
            title={`What differs: v${baseVersion} → v${proposedVersion}`}
            actions={
              <div className="flex flex-wrap gap-2">
                <a href={`/api/changeovers/${co.id}/io-sheet`} download className={linkButton} data-testid="io-sheet-download">
                  <FileSpreadsheet aria-hidden className="h-4 w-4" /> I/O change sheet (CSV)
                </a>
                <a href={`/api/changeovers/${co.id}/diff`} className={linkButton} target="_blank" rel="noreferrer">
                  <Braces aria-hidden className="h-4 w-4" /> Diff (JSON)
                </a>
                {co.state === 'signed-off' || co.state === 'rolled-back' ? (
                  <Link href={`/changeovers/${co.id}/record`} className={linkButton}>
                    <FileText aria-hidden className="h-4 w-4" /> Signed record
                  </Link>
                ) : null}
              </div>
            }
          >
            <div className="space-y-6">
              {following ? (
                <p className="text-sm text-slate-600">While drafting, this compares the base with the cell’s latest version; it changes as the proposal is edited.</p>
              ) : null}
              <DiffSummaryChips diff={diff} />
              <DiffAreas diff={diff} baseVersion={baseVersion} proposedVersion={proposedVersion} skip={['logic']} />
            </div>
          </Card>
        </section>

        <section id="logic" className="scroll-mt-6">
          <Card title="Logic sheet, marked">
            <div id="diff-logic">
              <LogicDiff base={base.plc.sheet} proposed={proposed.plc.sheet} entries={diff.areas.logic} baseVersion={baseVersion} proposedVersion={proposedVersion} />
            </div>
          </Card>
        </section>

        <section id="history" className="scroll-mt-6">
          <Card title="History">
            <ChangeoverHistory events={events} />
          </Card>
        </section>
      </div>
    </>
  );
}
