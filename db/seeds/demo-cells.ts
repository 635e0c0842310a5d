import type { Knex } from 'knex';
import { cellDocumentSchema } from '@/simulator';
import { templateDocument } from '@/lib/cells/templates';

const MARKER = 'demo-cells-v1';

export const DEMO_CELL_NAMES = {
  pickAndPlace: 'Kestrel Vale Cell B — pick and place',
  panelStarter: 'Kestrel Vale starter — start/stop with seal-in',
  leadCopy: 'Tallowmere line 3 rehearsal — pick and place',
} as const;

/**
 * Demo cells, once: the demo trainer owns the pick-and-place demo and the panel starter,
 * both shared with the demo cohort; the demo lead owns a copy of the pick-and-place cell.
 * Uses the Knex it is given (no `server-only` data modules): it runs under tsx and vitest's
 * global setup as well as the app. Returns false when it had already run.
 */
export async function seedDemoCells(knex: Knex): Promise<boolean> {
  return knex.transaction(async (trx) => {
    const trainer = await trx('users').where({ email: 'trainer@kestrelvale.test' }).first('id');
    const lead = await trx('users').where({ email: 'lead@brennick.test' }).first('id');
    const cohort = trainer ? await trx('cohorts').where({ trainer_id: trainer.id }).orderBy('created_at').first('id') : undefined;
    // Without the demo people there is nothing to attach cells to (and no marker, so a later run still seeds).
    if (!trainer || !lead || !cohort) return false;
    const inserted = await trx('seed_markers').insert({ name: MARKER }).onConflict('name').ignore().returning('name');
    if (inserted.length === 0) return false;

    const addCell = async (ownerId: string, name: string, document: unknown, origin: string, message: string, source?: string) => {
      const parsed = cellDocumentSchema.parse(document);
      const [cell] = await trx('cells')
        .insert({ name, owner_id: ownerId, origin, source_cell_id: source ?? null, source_version: source ? 1 : null })
        .returning('id');
      await trx('cell_versions').insert({ cell_id: cell.id, version: 1, document: JSON.stringify({ ...parsed, name }), author_id: ownerId, message });
      return cell.id as string;
    };
    const pick = await addCell(trainer.id, DEMO_CELL_NAMES.pickAndPlace, templateDocument('pick-and-place', DEMO_CELL_NAMES.pickAndPlace), 'template', 'Demo cell');
    const panel = await addCell(trainer.id, DEMO_CELL_NAMES.panelStarter, templateDocument('panel-starter', DEMO_CELL_NAMES.panelStarter), 'template', 'Demo cell');
    await trx('cell_shares').insert([
      { cell_id: pick, cohort_id: cohort.id, shared_by: trainer.id },
      { cell_id: panel, cohort_id: cohort.id, shared_by: trainer.id },
    ]);
    await addCell(
      lead.id,
      DEMO_CELL_NAMES.leadCopy,
      templateDocument('pick-and-place', DEMO_CELL_NAMES.leadCopy),
      'duplicate',
      `Duplicated from "${DEMO_CELL_NAMES.pickAndPlace}" version 1`,
      pick,
    );
    return true;
  });
}
