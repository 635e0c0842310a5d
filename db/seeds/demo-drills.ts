import type { Knex } from 'knex';
import { cellDocumentSchema } from '@/simulator';
import { DEMO_ASSIGNED_DRILL, DRILL_LIBRARY, LIBRARY_BASE_NAMES, libraryBaseDocument, type LibraryBase } from '@/lib/drills/library';
import { drillInputSchema } from '@/lib/schemas/drills';
import { drillColumns } from '../drill-columns';
import { DEMO_CELL_NAMES } from './demo-cells';

const MARKER = 'demo-drills-v1';
const DAY_MS = 86_400_000;

/**
 * The built-in drill library, once, for the demo trainer: the variant base cells it needs, every
 * library drill, and one drill assigned to the demo cohort (open now, closing in 14 days). No
 * e-mail is sent from a seed. Uses the Knex it is given (no `server-only` modules), like the
 * cells seed. Returns false when it had already run or the demo people and cells are missing.
 */
export async function seedDemoDrills(knex: Knex, demoCohortName: string): Promise<boolean> {
  return knex.transaction(async (trx) => {
    const trainer = await trx('users').where({ email: 'trainer@kestrelvale.test' }).first('id');
    if (!trainer) return false;
    const cohort = await trx('cohorts').where({ trainer_id: trainer.id, name: demoCohortName }).first('id');
    const pick = await trx('cells').where({ owner_id: trainer.id, name: DEMO_CELL_NAMES.pickAndPlace }).whereNull('deleted_at').first('id');
    if (!cohort || !pick) return false;
    const inserted = await trx('seed_markers').insert({ name: MARKER }).onConflict('name').ignore().returning('name');
    if (inserted.length === 0) return false;

    const bases = new Map<LibraryBase, string>([['pick-and-place', pick.id]]);
    for (const [base, name] of Object.entries(LIBRARY_BASE_NAMES) as [Exclude<LibraryBase, 'pick-and-place'>, string][]) {
      const document = cellDocumentSchema.parse(libraryBaseDocument(base));
      const [cell] = await trx('cells').insert({ name, owner_id: trainer.id, origin: 'template' }).returning('id');
      await trx('cell_versions').insert({ cell_id: cell.id, version: 1, document: JSON.stringify(document), author_id: trainer.id, message: 'Drill library base' });
      bases.set(base, cell.id);
    }

    let assignedDrill: string | null = null;
    for (const d of DRILL_LIBRARY) {
      const input = drillInputSchema.parse({ ...d.input, cellId: bases.get(d.base)!, cellVersion: 1 });
      const [row] = await trx('drills')
        .insert({
          trainer_id: trainer.id,
          library_key: d.key,
          ...drillColumns(input),
        })
        .returning('id');
      if (d.key === DEMO_ASSIGNED_DRILL) assignedDrill = row.id;
    }
    if (assignedDrill) {
      const now = Date.now();
      await trx('assignments').insert({
        drill_id: assignedDrill,
        cohort_id: cohort.id,
        opens_at: new Date(now - DAY_MS),
        closes_at: new Date(now + 14 * DAY_MS),
        assigned_by: trainer.id,
      });
    }
    return true;
  });
}
