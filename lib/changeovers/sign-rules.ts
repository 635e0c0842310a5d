import type { Evidence } from './evidence';
import type { Changeover } from './types';

/**
 * The one rule of when a changeover may be signed or countersigned, shared by the sign-off
 * routes (lib/changeovers/sign-off.ts) and the page that shows why the buttons wait. Pure and
 * client-safe: the evidence type is only a type.
 */

/**
 * What stands between this changeover and a signature, as sentences (empty when it may be
 * signed): the evidence's own blockers (lib/changeovers/evidence.ts words them), and — as a
 * guard of its own, should the evidence ever not say so — an unpinned proposal or evidence that
 * ran on other versions than the pin.
 */
export function signBlockers(co: Pick<Changeover, 'baseVersion' | 'pinnedVersion'>, evidence: Pick<Evidence, 'ready' | 'blockers' | 'ranOn'>): string[] {
  const out = [...evidence.blockers];
  if (out.length > 0) return out;
  if (co.pinnedVersion === null) out.push('The proposal is not pinned yet: pin it and run the checks, so the signatures cover one fixed version.');
  else if (!evidence.ranOn) out.push('No proofs or checks have run on the pinned proposal yet.');
  else if (evidence.ranOn.baseVersion !== co.baseVersion || evidence.ranOn.proposedVersion !== co.pinnedVersion) {
    out.push(`The evidence ran on version ${evidence.ranOn.baseVersion} → ${evidence.ranOn.proposedVersion}, but the changeover is pinned at ${co.baseVersion} → ${co.pinnedVersion}: run the checks again.`);
  }
  if (!evidence.ready && out.length === 0) out.push('The evidence is not ready yet.');
  return out;
}
