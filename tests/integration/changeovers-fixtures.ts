/**
 * Fixtures for the changeover tests and matrix rows: a pick-and-place cell whose version 2 is
 * the demo proposal (rear guard door, DI card to slot 6), a changeover on it, and evidence
 * made the way the worker makes it (the proofs job run in-process on a fresh run).
 */
import { createCell, saveVersion } from '@/db/cells';
import { openChangeover, pinProposal, setCountersigner } from '@/db/changeovers';
import { acceptEvidence, findVerdict, listVerdicts, openEvidenceRun } from '@/db/changeover-evidence';
import { createInterlockRule, listInterlockRules, toInterlockRule, type InterlockRuleBody } from '@/db/interlock-rules';
import { demoChangeoverProposal } from '@/db/seeds/demo-changeovers';
import { runChangeoverProofs } from '@/lib/changeovers/jobs';
import { proofsInputsSha256 } from '@/lib/changeovers/prove-rules';
import { cellDocumentSchema, pickAndPlaceCell, type CellDocument } from '@/simulator';

export const baseDocument = (): CellDocument => cellDocumentSchema.parse({ ...structuredClone(pickAndPlaceCell), name: 'Changeover test cell' });

/** A cell owned by `ownerId`: version 1 the pick-and-place demo, version 2 (unless `edited` is false) the demo proposal. */
export async function cellWithProposal(ownerId: string, edited = true): Promise<string> {
  const base = baseDocument();
  const cell = await createCell({ ownerId, name: 'Changeover test cell', origin: 'template', document: base, message: 'base' });
  if (edited) {
    const saved = await saveVersion(cell.id, ownerId, 1, demoChangeoverProposal(base), 'proposal');
    if (!saved.ok) throw new Error('fixture: could not save the proposal');
  }
  return cell.id;
}

/** A drafting changeover (base version 1) on a fresh cell of `ownerId`, optionally with a countersigner named. */
export async function draftingChangeover(ownerId: string, opts: { edited?: boolean; countersignerId?: string; title?: string } = {}): Promise<{ id: string; cellId: string }> {
  const cellId = await cellWithProposal(ownerId, opts.edited ?? true);
  const made = await openChangeover({ cellId, openedBy: ownerId, title: opts.title ?? 'Test changeover', description: 'Rear guard door and DI card move', baseVersion: 1 });
  if (!made.ok) throw new Error('fixture: could not open the changeover');
  if (opts.countersignerId) {
    await setCountersigner(made.changeover.id, ownerId, { id: opts.countersignerId, name: 'countersigner' });
  }
  return { id: made.changeover.id, cellId };
}

/** A rule the demo proposal keeps: an open front guard always lights the yellow tier. */
export const YELLOW_ON_OPEN_GUARD: { title: string; body: InterlockRuleBody } = {
  title: 'Yellow tier lit whenever the front guard is open',
  body: { kind: 'never', what: { signal: '%QX1.1', value: 'off' }, while: { signal: '%IX0.4', value: 'off' } },
};

/** The rule the demo proposal breaks: the robot is told "guard closed" only with both doors closed. */
export const ROBOT_GUARD_BOTH_DOORS: { title: string; body: InterlockRuleBody } = {
  title: 'Guard closed to the robot only with both doors closed',
  body: { kind: 'only-if', what: { signal: '%QX0.3', value: 'on' }, requires: [{ signal: '%IX0.4', value: 'on' }, { signal: '%IX0.7', value: 'on' }] },
};

/**
 * Pins the changeover and runs its proofs in-process on `rules` (added to the cell first),
 * as the worker would. Returns the proposal's verdicts by rule title.
 */
export async function pinAndProve(
  changeoverId: string,
  cellId: string,
  userId: string,
  rules: { title: string; body: InterlockRuleBody }[],
): Promise<Map<string, { id: string; status: string }>> {
  const pin = await pinProposal(changeoverId, userId);
  if (!pin.ok) throw new Error(`fixture: pin refused (${pin.reason})`);
  if ((await listInterlockRules(cellId)).length === 0) for (const r of rules) await createInterlockRule(cellId, userId, r);
  const stored = (await listInterlockRules(cellId)).map(toInterlockRule);
  const { run } = await openEvidenceRun({
    changeoverId,
    kind: 'proofs',
    baseVersion: pin.baseVersion,
    proposedVersion: pin.proposedVersion,
    inputsSha256: proofsInputsSha256(stored, pin.baseVersion, pin.proposedVersion),
    total: stored.length * 2,
    requestedBy: userId,
  });
  const result = await runChangeoverProofs({ changeoverId, runId: run.id });
  if (result.status !== 'done') throw new Error(`fixture: proofs ${result.status}: ${result.summary}`);
  const out = new Map<string, { id: string; status: string }>();
  for (const v of await listVerdicts(run.id)) if (v.side === 'proposed') out.set(v.title, { id: v.id, status: v.status });
  return out;
}

/** Accepts every violated or undecided verdict on the proposal of the latest proofs, with a reason. */
export async function acceptViolations(changeoverId: string, userId: string, verdicts: Map<string, { id: string; status: string }>): Promise<void> {
  for (const v of verdicts.values()) {
    if (v.status !== 'violated' && v.status !== 'undecided') continue;
    const stored = await findVerdict(changeoverId, v.id);
    if (!stored) throw new Error('fixture: verdict missing');
    await acceptEvidence({
      changeoverId,
      kind: 'proof',
      subject: stored.ruleId,
      fingerprint: stored.fingerprint,
      reason: 'The robot guard signal is re-wired in the follow-up change next week.',
      by: userId,
    });
  }
}
