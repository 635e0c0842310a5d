/**
 * The migration that renames the handshake role `job` to `recipe` in stored cell documents
 * (schema version 1 → 2), against the real test database, inside a transaction that is rolled
 * back: it rewrites version-1 rows exactly as the engine's upgrade does, leaves the versions a
 * signed changeover record names as they were signed, keeps every re-simulated trace hash, and
 * its down step gives back the rows it changed.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Knex } from 'knex';
import { cellDocumentSchema, pickAndPlaceCell, replay, signalNamesOf, upgradeCellDocument } from '@/simulator';
import { closeDb, db } from '@/db/knex';
import * as migration from '@/db/migrations/20261204_701_handshake_recipe_role';
import { documentSha256 } from '@/lib/changeovers/hash';
import { demoUser } from './helpers';

type Json = Record<string, unknown>;
type Doc = Json & { controller: { handshake: { inputs: Json } } };

/** A document as schema version 1 stored it: the recipe word under the role `job`. */
function versionOne(name: string): Doc {
  const doc = cellDocumentSchema.parse(structuredClone(pickAndPlaceCell)) as unknown as Doc;
  const { recipe, ...inputs } = doc.controller.handshake.inputs;
  doc.controller.handshake.inputs = { ...inputs, job: recipe };
  return { ...doc, name, schemaVersion: 1 } as Doc;
}

const LOG = [
  { t: 1000, event: { type: 'set-selector', device: 'recipe', position: 1 } },
  { t: 2000, event: { type: 'set-field', device: 'part', active: true } },
  { t: 2100, event: { type: 'press', device: 'start' } },
  { t: 2160, event: { type: 'release', device: 'start' } },
];

let trx: Knex.Transaction;
let cellId: string;
const stored = async (version: number): Promise<Doc> =>
  (await trx('cell_versions').where({ cell_id: cellId, version }).first('document')).document as Doc;

beforeAll(async () => {
  const lead = await demoUser('lead@brennick.test');
  const countersigner = await demoUser('shift.lead@brennick.test');
  trx = await db().transaction();
  [{ id: cellId }] = await trx('cells').insert({ name: 'Migration check', owner_id: lead.id, origin: 'new' }).returning('id');
  // Versions 1 and 2 are the base and proposal of a signed changeover; version 3 came later.
  for (const version of [1, 2, 3]) {
    await trx('cell_versions').insert({ cell_id: cellId, version, document: JSON.stringify(versionOne(`v${version}`)), author_id: lead.id, message: `v${version}` });
  }
  const now = new Date();
  const [co] = await trx('changeovers')
    .insert({ cell_id: cellId, title: 'Signed', opened_by: lead.id, base_version: 1, proposed_version: 2, pinned_at: now, state: 'signed-off', signed_by: lead.id, signed_at: now, countersigner_id: countersigner.id })
    .returning('id');
  await trx('changeover_records').insert({
    changeover_id: co.id,
    cell_id: cellId,
    cell_name: 'Migration check',
    title: 'Signed',
    description: '',
    base_version: 1,
    proposed_version: 2,
    base_sha256: documentSha256(versionOne('v1')),
    proposed_sha256: documentSha256(versionOne('v2')),
    diff_summary: JSON.stringify({}),
    evidence: JSON.stringify({}),
    signed_by: lead.id,
    signed_by_name: lead.name,
    signed_at: now,
    countersigned_by: countersigner.id,
    countersigned_by_name: countersigner.name,
    countersigned_by_role: countersigner.role,
    countersigned_at: now,
  });
  await migration.up(trx);
});

afterAll(async () => {
  await trx.rollback();
  await closeDb();
});

describe('migration 20261204_701: handshake role job → recipe', () => {
  it('rewrites a version-1 document to what the engine\'s upgrade makes of it', async () => {
    const after = await stored(3);
    expect(after.schemaVersion).toBe(2);
    expect(after.controller.handshake.inputs.recipe).toBe('WI1');
    expect(after.controller.handshake.inputs).not.toHaveProperty('job');
    expect(after).toEqual(upgradeCellDocument(versionOne('v3')));
    expect(cellDocumentSchema.safeParse(after).success).toBe(true);
  });

  it('leaves the versions a signed record names as signed: their SHA-256 still matches the record', async () => {
    const record = await trx('changeover_records').where({ cell_id: cellId }).first('base_sha256', 'proposed_sha256');
    expect(documentSha256(await stored(1))).toBe(record.base_sha256);
    expect(documentSha256(await stored(2))).toBe(record.proposed_sha256);
    expect((await stored(1)).schemaVersion).toBe(1);
  });

  it('keeps signal names and trace hashes: a run re-simulated on the rewritten row hashes as on the old one', async () => {
    const names = signalNamesOf(versionOne('v3'));
    if (!names.ok) throw new Error(JSON.stringify(names.errors));
    expect(signalNamesOf(await stored(3))).toEqual(names);
    const before = replay(versionOne('v3'), LOG, { trace: names.value, untilMs: 15_000 });
    const after = replay(await stored(3), LOG, { trace: names.value, untilMs: 15_000 });
    if (!before.ok || !after.ok) throw new Error(JSON.stringify([before, after]));
    expect(after.value.hash).toBe(before.value.hash);
  });

  it('comes down to the rows it changed, exactly, and goes up again', async () => {
    await migration.down(trx);
    expect(await stored(3)).toEqual(versionOne('v3'));
    expect(await stored(1)).toEqual(versionOne('v1'));
    await migration.up(trx);
    expect((await stored(3)).schemaVersion).toBe(2);
  });
});
