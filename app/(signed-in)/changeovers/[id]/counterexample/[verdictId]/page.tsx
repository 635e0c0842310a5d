import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { PageHeader } from '@/components/ui/card';
import { Notice } from '@/components/ui/notice';
import { Refused } from '@/components/ui/refused';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { CounterexampleView } from '@/components/changeovers/counterexample-view';
import { bitSignalOptions, optionLabels } from '@/components/rules/signal-catalogue';
import { interlockSentence } from '@/components/rules/sentences';
import { requirePageUser } from '@/lib/auth/session';
import { loadOrNotFound, paramsOrNotFound } from '@/lib/pages/not-found';
import { changeoverForReader } from '@/lib/changeovers/access';
import { changeoverVerdictParamSchema } from '@/lib/schemas/evidence';
import { findVerdict } from '@/db/changeover-evidence';
import { getVersion } from '@/db/cells';
import { counterexampleEvents, counterexampleFailsAtMs, ruleAddresses } from '@/simulator';
import { ROLE_TABLE } from '@/lib/roles';

export const metadata: Metadata = { title: 'Counterexample · Cellwright' };

/** Scans shown after the failing one, so the broken state is seen holding (or not). */
const TAIL_SCANS = 5;

/**
 * The counterexample of a violated interlock rule, on the version the proof ran on: the input
 * sequence as a table and in the replay player, the scope on the rule's signals with the
 * failing scan marked. Readers of the changeover only (others 404, students refused).
 */
export default async function CounterexamplePage({ params }: { params: Promise<{ id: string; verdictId: string }> }) {
  const raw = await params;
  const { user, allowed } = await requirePageUser(`/changeovers/${raw.id}/counterexample/${raw.verdictId}`, ROLE_TABLE.changeovers);
  if (!allowed) return <Refused role={user.role} needs="leads, trainers and admins" />;
  const { id, verdictId } = paramsOrNotFound(changeoverVerdictParamSchema, raw);
  const co = await loadOrNotFound(changeoverForReader(user, id));
  const verdict = await findVerdict(co.id, verdictId);
  if (!verdict) notFound();
  const version = await getVersion(co.cellId, verdict.version);
  if (!version) notFound();
  const labels = optionLabels(bitSignalOptions(version.document));
  const sentence = interlockSentence(verdict.rule, labels);
  const side = verdict.side === 'base' ? 'base' : 'proposal';
  const back = (
    <Link href={`/changeovers/${co.id}`} className="text-sm font-medium text-accent-700 hover:underline">
      Back to the changeover
    </Link>
  );
  const v = verdict.verdict;
  if (v.status !== 'violated') {
    return (
      <>
        <PageHeader title={`Counterexample: ${verdict.title}`} description={sentence} actions={back} />
        <Notice>This verdict is {v.status}: only a violated rule has a counterexample.</Notice>
      </>
    );
  }
  const cex = v.counterexample;
  const period = version.document.plc.sheet.scanPeriodMs;
  const failsAtMs = counterexampleFailsAtMs(cex, version.document);
  return (
    <>
      <PageHeader
        title={`Counterexample: ${verdict.title}`}
        description={`${co.title} · ${co.cellName}, the ${side} (version ${verdict.version}) · ${sentence}`}
        actions={back}
      />
      <div className="space-y-4">
        <Notice>
          The shortest run the prover found in which the rule breaks: {cex.scans.length} scan{cex.scans.length === 1 ? '' : 's'} from power-on, the rule broken after scan {cex.failsAtScan + 1} (
          {failsAtMs} ms). It plays below on version {verdict.version}’s own cell; a proof covers the modelled logic only, not the wiring, the devices or the real cell’s safety-rated
          circuits.
        </Notice>
        <CounterexampleView
          document={version.document}
          events={counterexampleEvents(cex, version.document)}
          failsAtMs={failsAtMs}
          endMs={failsAtMs + TAIL_SCANS * period}
          scanPeriodMs={period}
          ruleTitle={verdict.title}
          inputs={cex.inputs}
          signals={ruleAddresses(verdict.rule)}
          labels={labels}
          scans={cex.scans}
        />
        <SafetyCaution compact />
      </div>
    </>
  );
}
