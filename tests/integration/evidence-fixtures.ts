/**
 * A changeover of its own for each evidence test (a fresh copy of the demo lead's line 3 cell:
 * version 1 as it runs today, version 2 the demo proposal with the rear guard door and the
 * moved DI card), with the demo's interlock rules and scenarios, so the tests never lean on
 * (or change) the seeded demo changeover that other test files read.
 */
import { cellDocumentSchema, pickAndPlaceCell } from '@/simulator';
import { createCell, saveVersion } from '@/db/cells';
import { openChangeover, type Changeover } from '@/db/changeovers';
import { createInterlockRule } from '@/db/interlock-rules';
import { createScenario } from '@/db/scenarios';
import { demoChangeoverProposal } from '@/db/seeds/demo-changeovers';
import { DEMO_INTERLOCK_RULES, DEMO_SCENARIOS } from '@/db/seeds/demo-evidence';
import type { User } from '@/db/users';

export async function evidenceChangeover(owner: User, opts: { rules?: boolean; scenarios?: boolean } = {}): Promise<{ changeover: Changeover; cellId: string }> {
  const base = cellDocumentSchema.parse(structuredClone(pickAndPlaceCell));
  const cell = await createCell({ ownerId: owner.id, name: `Evidence cell ${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`, origin: 'template', document: base, message: 'today' });
  const saved = await saveVersion(cell.id, owner.id, 1, demoChangeoverProposal(base), 'rear guard door, DI card to slot 6');
  if (!saved.ok) throw new Error('fixture: proposal not saved');
  if (opts.rules !== false) for (const r of DEMO_INTERLOCK_RULES) await createInterlockRule(cell.id, owner.id, r);
  if (opts.scenarios !== false) {
    for (const s of DEMO_SCENARIOS) {
      const made = await createScenario({ cellId: cell.id, ...s, faults: [], seed: null, sourceRunId: null, createdBy: owner.id });
      if (!made.ok) throw new Error('fixture: scenario not made');
    }
  }
  const opened = await openChangeover({ cellId: cell.id, openedBy: owner.id, title: 'Evidence test changeover', description: '', baseVersion: 1 });
  if (!opened.ok) throw new Error('fixture: changeover not opened');
  return { changeover: opened.changeover, cellId: cell.id };
}
