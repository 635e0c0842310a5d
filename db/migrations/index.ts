import type { Knex } from 'knex';
import * as m001 from './20261201_001_users';
import * as m002 from './20261201_002_cohorts';
import * as m003 from './20261201_003_auth_support';
import * as m004 from './20261201_004_mail_and_seed';
import * as m101 from './20261201_101_cells';
import * as m201 from './20261201_201_drills_and_runs';
import * as m301 from './20261202_001_session_generation';
import * as m401 from './20261204_101_run_times_bigint';
import * as m402 from './20261204_201_auth_throttles';
import * as mJobs from './20261204_301_jobs';
import * as mChangeovers from './20261204_401_changeovers';
import * as mEvidence from './20261204_402_changeover_evidence';
import * as mLiveBoard from './20261204_601_live_board';
import * as mRecipeRole from './20261204_701_handshake_recipe_role';
import * as mObjectStorage from './20261204_801_object_storage';

interface Migration {
  up(knex: Knex): Promise<void>;
  down(knex: Knex): Promise<void>;
}

/**
 * Every migration, oldest first. Add a new file here as well as in this folder
 * (DEVELOPERS.md, "Add a migration"): the static list works under Next.js,
 * tsx and vitest alike, where a directory loader would need a .ts loader.
 */
const migrations: ReadonlyArray<readonly [string, Migration]> = [
  ['20261201_001_users', m001],
  ['20261201_002_cohorts', m002],
  ['20261201_003_auth_support', m003],
  ['20261201_004_mail_and_seed', m004],
  ['20261201_101_cells', m101],
  ['20261201_201_drills_and_runs', m201],
  ['20261202_001_session_generation', m301],
  ['20261204_101_run_times_bigint', m401],
  ['20261204_201_auth_throttles', m402],
  ['20261204_301_jobs', mJobs],
  ['20261204_401_changeovers', mChangeovers],
  ['20261204_402_changeover_evidence', mEvidence],
  ['20261204_601_live_board', mLiveBoard],
  ['20261204_701_handshake_recipe_role', mRecipeRole],
  ['20261204_801_object_storage', mObjectStorage],
];

export const migrationSource: Knex.MigrationSource<readonly [string, Migration]> = {
  getMigrations: async () => migrations.slice(),
  getMigrationName: (m) => m[0],
  getMigration: async (m) => m[1],
};
