import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { PageHeader } from '@/components/ui/card';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { RunReplay } from '@/components/replay/run-replay';
import { FollowLive } from '@/components/live/follow-live';
import { requirePageUser } from '@/lib/auth/session';
import { loadOrNotFound, paramsOrNotFound } from '@/lib/pages/not-found';
import { runForReader } from '@/lib/runs/access';
import { runIdParamSchema } from '@/lib/schemas/runs';
import { findDrill } from '@/db/drills';
import { getVersion } from '@/db/cells';

export const metadata: Metadata = { title: 'Replay · Cellwright' };

/**
 * Replay of a run for its owner, its drill's trainer or an admin. The drill's fault cards and the
 * rule marks are handed to the browser only when the reader may see hidden parts (the same rule
 * as the run routes: trainer and admin always, the student once every assignment of the drill
 * they could attempt has closed). A drill run's seed never reaches its student (a practice run's
 * seed was chosen by the student's own browser), so an intermittent fault may replay there with
 * another pattern than the one the student met.
 */
export default async function ReplayPage({ params }: { params: Promise<{ id: string }> }) {
  const raw = await params;
  const { user } = await requirePageUser(`/runs/${raw.id}/replay`);
  const { id } = paramsOrNotFound(runIdParamSchema, raw);
  const found = await loadOrNotFound(runForReader(user, id));
  const { run, hiddenVisible } = found;
  const version = await getVersion(run.cellId, run.cellVersion);
  if (!version) notFound();
  const drill = run.drillId ? await findDrill(run.drillId, { includeDeleted: true }) : null;
  const violations = hiddenVisible && run.breakdown ? run.breakdown.rules.filter((r) => r.violation).map((r) => ({ timeMs: r.violation!.timeMs, rule: r.label ?? r.id, message: r.violation!.message })) : [];
  const first = violations.sort((a, b) => a.timeMs - b.timeMs)[0] ?? null;
  const replay = (
    <RunReplay
      runId={run.id}
      document={version.document}
      faults={hiddenVisible && drill ? drill.faults : null}
      seed={found.reader !== 'owner' || run.mode === 'practice' ? run.seed : null}
      hiddenVisible={hiddenVisible}
      mode={run.mode}
      violation={first}
    />
  );
  // A running student's drill run, watched by the drill's trainer or an admin: followed from the live board's stream.
  const following = found.reader !== 'owner' && run.assignmentId !== null && run.status === 'active';
  return (
    <>
      <PageHeader
        title={`Replay: ${drill ? drill.title : 'free practice'}`}
        description={`${run.userName} · cell version ${run.cellVersion}`}
        actions={
          <Link href={`/runs/${run.id}`} className="text-sm font-medium text-accent-700 hover:underline">
            Back to the result
          </Link>
        }
      />
      <SafetyCaution compact className="mb-4" />
      {following && run.assignmentId ? (
        <FollowLive assignmentId={run.assignmentId} runId={run.id}>
          {replay}
        </FollowLive>
      ) : (
        replay
      )}
    </>
  );
}
