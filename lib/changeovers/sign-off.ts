import 'server-only';
import { ApiError } from '@/lib/api/errors';
import type { User } from '@/db/users';
import { countersignChangeover, findChangeover, signChangeover, withdrawSignature } from '@/db/changeovers';
import type { SignatureInput } from '@/lib/schemas/changeovers';
import { runAfterResponse } from '@/lib/after-response';
import { queueChangeoverReport } from '@/lib/reports/changeover-report-files';
import { diffCells } from '@/simulator';
import { changeoverDocuments } from './diff';
import { loadEvidence } from './evidence';
import { documentSha256 } from './hash';
import { stateConflict } from './service';
import { signBlockers } from './sign-rules';
import type { Changeover, SignedRecord } from './types';

/**
 * Sign-off (issue #10, point 6). The person who opened the changeover signs; a second person —
 * another lead, a trainer or the administrator, never the same person — countersigns, which
 * writes the immutable record. Both acts need the evidence to be ready: every proof proved or
 * its violation accepted with a written reason, every changed scenario outcome accepted, all
 * on the pinned proposal. What stands in the way is answered as 409 with `blockers`, one
 * plain sentence each, so the page can say exactly why.
 */

function notReady(what: string, blockers: string[]): ApiError {
  return new ApiError(409, `${what}: ${blockers[0]}${blockers.length > 1 ? ` (and ${blockers.length - 1} more)` : ''}`, undefined, { body: { blockers } });
}

/** The signer types their own name: a deliberate act, and a check that the right person is at the keyboard. */
function checkTypedName(user: User, typed: string): void {
  const norm = (s: string) => s.normalize('NFKC').trim().replace(/\s+/g, ' ').toLowerCase();
  if (norm(typed) !== norm(user.name)) {
    throw new ApiError(422, 'Some fields are not valid.', { confirmName: [`Type your name as it is on your account: ${user.name}.`] });
  }
}

function checkPin(co: Changeover, body: SignatureInput): void {
  if (co.baseVersion !== body.baseVersion || co.pinnedVersion !== body.proposedVersion) {
    throw new ApiError(409, `The changeover moved on since you looked: it is now version ${co.baseVersion} → ${co.pinnedVersion ?? co.proposedVersion}. Review it again.`, undefined, {
      body: { baseVersion: co.baseVersion, proposedVersion: co.pinnedVersion },
    });
  }
}

/** The opener's signature. */
export async function signFor(user: User, co: Changeover, body: SignatureInput): Promise<Changeover> {
  if (co.state !== 'checked' && co.state !== 'drafting') throw stateConflict(co.state, 'it can no longer be signed.');
  checkTypedName(user, body.confirmName);
  if (co.signedBy) throw new ApiError(409, `You already signed this changeover on ${co.signedAt?.slice(0, 10)}; it waits for a countersignature.`);
  const blockers = signBlockers(co, await loadEvidence(co.id));
  if (blockers.length > 0) throw notReady('Not ready to sign', blockers);
  checkPin(co, body);
  const r = await signChangeover(co.id, user.id, { baseVersion: body.baseVersion, proposedVersion: body.proposedVersion });
  if (!r.ok) {
    if (r.reason === 'missing') throw new ApiError(404, 'No such changeover.');
    if (r.reason === 'state') throw stateConflict(r.state, 'it can no longer be signed.');
    if (r.reason === 'already-signed') throw new ApiError(409, 'This changeover is already signed; it waits for a countersignature.');
    throw new ApiError(409, 'The changeover was re-pinned while you signed. Review it again.');
  }
  return (await findChangeover(co.id))!;
}

/** Takes back the opener's signature (before a countersignature), e.g. to re-pin after a late edit. */
export async function withdrawSignatureFor(user: User, co: Changeover): Promise<Changeover> {
  const r = await withdrawSignature(co.id, user.id);
  if (!r.ok) {
    if (r.reason === 'missing') throw new ApiError(404, 'No such changeover.');
    throw stateConflict(r.state, 'its signatures stand.');
  }
  return (await findChangeover(co.id))!;
}

/**
 * The countersignature: checks the second person, re-checks the evidence (an acceptance may
 * have been taken back since the first signature), then writes the record with both documents'
 * SHA-256 hashes, the diff summary and every verdict and check with its accepted reason.
 */
export async function countersignFor(user: User, co: Changeover, body: SignatureInput): Promise<SignedRecord> {
  // Who you are comes first: the signer is refused whatever state the changeover is in.
  if (co.signedBy?.id === user.id) throw new ApiError(403, 'You signed this changeover: a second person must countersign it.');
  if (co.openedBy.id === user.id || co.cellOwnerId === user.id) {
    throw new ApiError(403, 'You opened this changeover: a second person must countersign it.');
  }
  if (co.state !== 'checked') throw stateConflict(co.state, co.state === 'drafting' ? 'the person who opened it signs first.' : 'it cannot be countersigned.');
  checkTypedName(user, body.confirmName);
  if (!co.signedBy) throw new ApiError(409, `${co.openedBy.name} has not signed this changeover yet: the countersignature comes second.`);
  const evidence = await loadEvidence(co.id);
  const blockers = signBlockers(co, evidence);
  if (blockers.length > 0) throw notReady('Not ready to countersign', blockers);
  checkPin(co, body);

  const docs = await changeoverDocuments(co);
  const diff = diffCells(docs.base, docs.proposed);
  const r = await countersignChangeover(
    co.id,
    { id: user.id, name: user.name, role: user.role },
    { baseVersion: body.baseVersion, proposedVersion: body.proposedVersion },
    {
      cellName: co.cellName,
      title: co.title,
      description: co.description,
      baseVersion: docs.baseVersion,
      proposedVersion: docs.proposedVersion,
      baseSha256: documentSha256(docs.base),
      proposedSha256: documentSha256(docs.proposed),
      diffSummary: diff.summary,
      evidence: { ranOn: evidence.ranOn, proofs: evidence.proofs, checks: evidence.checks },
    },
  );
  if (!r.ok) {
    if (r.reason === 'missing') throw new ApiError(404, 'No such changeover.');
    if (r.reason === 'state') throw stateConflict(r.state, 'it cannot be countersigned.');
    if (r.reason === 'same-person') throw new ApiError(403, 'You signed this changeover: a second person must countersign it.');
    if (r.reason === 'not-signed') throw new ApiError(409, 'The signature was withdrawn before you countersigned.');
    throw new ApiError(409, 'The changeover was re-pinned while you countersigned. Review it again.');
  }
  // The printed report (PDF) is made by a job, off this request; if queueing fails here, the
  // download route queues it when someone asks for it.
  runAfterResponse('queue the printed changeover report', async () => {
    await queueChangeoverReport(co.id, user.id);
  });
  return r.record;
}
