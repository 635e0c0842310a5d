import type { Knex } from 'knex';

/**
 * Cell documents, schema version 1 → 2: the handshake input role `job` is called `recipe`
 * (the engine's `upgradeCellDocument` does the same to any version-1 document it is given, so
 * a row this migration did not rewrite, or one an older app process writes while a deploy
 * rolls, still loads).
 *
 * Only `cell_versions.document` holds cell documents (drills, runs, changeovers and scenarios
 * point at a version by number). Only the role's key and the version number change: device,
 * wire and block ids stay, so every signal name, every re-simulated trace and the trace hashes
 * stored on submitted runs stay as they were (a regrade still matches).
 *
 * Up leaves the versions that a signed changeover record names as they were written: the
 * record keeps the SHA-256 of exactly those documents and the database refuses to change the
 * record, so the rows it vouches for stay what two people signed; the app reads them upgraded.
 * Down turns every version-2 document back (the code before this migration reads no other).
 *
 * The SQL avoids the jsonb `?` operator, which Knex would take for a binding.
 */
const role = (key: string) => `'{controller,handshake,inputs,${key}}'`;

function renameRole(from: string, to: string, fromVersion: number, toVersion: number, keepSigned: boolean): string {
  const signed = `exists (
    select 1 from changeover_records r
     where r.cell_id = v.cell_id and v.version in (r.base_version, r.proposed_version))`;
  return `
    update cell_versions v
       set document = (case
             when v.document #> ${role(from)} is not null
             then jsonb_set(v.document #- ${role(from)}, ${role(to)}, v.document #> ${role(from)})
             else v.document
           end) || '{"schemaVersion": ${toVersion}}'::jsonb
     where v.document -> 'schemaVersion' = '${fromVersion}'::jsonb
       ${keepSigned ? `and not ${signed}` : ''}`;
}

export async function up(knex: Knex): Promise<void> {
  await knex.raw(renameRole('job', 'recipe', 1, 2, true));
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(renameRole('recipe', 'job', 2, 1, false));
}
