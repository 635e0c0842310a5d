import type { Knex } from 'knex';
import { hashPassword } from '@/lib/password';
import type { Role } from '@/lib/roles';
import { seedDemoCells } from './demo-cells';
import { seedDemoDrills } from './demo-drills';
import { seedDemoRuns } from './demo-runs';
import { seedDemoEvidence } from './demo-evidence';
import { seedDemoChangeovers } from './demo-changeovers';

/** The invented demo scenario: a technical college's robot-cell class and a plant's maintenance lead. */
export const DEMO_COLLEGE = 'Kestrel Vale Technical College';
export const DEMO_PLANT = 'Brennick Fasteners, Tallowmere plant';
export const DEMO_COHORT = 'RC-27A Robot cell integration';

export interface DemoAccount {
  email: string;
  name: string;
  role: Role;
  password: string;
  organization: string;
}

export const DEMO_ACCOUNTS: readonly DemoAccount[] = [
  { email: 'admin@kestrelvale.test', name: 'Ines Halvorsen', role: 'admin', password: 'admin-demo-2026', organization: DEMO_COLLEGE },
  { email: 'trainer@kestrelvale.test', name: 'Tobias Okafor', role: 'trainer', password: 'trainer-demo-2026', organization: DEMO_COLLEGE },
  { email: 'ada.lindqvist@kestrelvale.test', name: 'Ada Lindqvist', role: 'student', password: 'student-demo-2026', organization: DEMO_COLLEGE },
  { email: 'ravi.mendez@kestrelvale.test', name: 'Ravi Mendez', role: 'student', password: 'student-demo-2026', organization: DEMO_COLLEGE },
  { email: 'noor.achterberg@kestrelvale.test', name: 'Noor Achterberg', role: 'student', password: 'student-demo-2026', organization: DEMO_COLLEGE },
  { email: 'lead@brennick.test', name: 'Greta Pallister', role: 'lead', password: 'lead-demo-2026', organization: DEMO_PLANT },
];

const MARKER = 'demo-v1';

/** Seed the demo once; returns false when it had already run (nothing is changed then). */
export async function seedDemo(knex: Knex): Promise<boolean> {
  const seeded = await seedDemoPeople(knex);
  // Cells have their own marker, so a database seeded before cells existed gets them too.
  await seedDemoCells(knex);
  await seedDemoDrills(knex, DEMO_COHORT);
  await seedDemoRuns(knex, DEMO_COHORT);
  await seedDemoChangeovers(knex);
  await seedDemoEvidence(knex);
  return seeded;
}

async function seedDemoPeople(knex: Knex): Promise<boolean> {
  return knex.transaction(async (trx) => {
    const inserted = await trx('seed_markers').insert({ name: MARKER }).onConflict('name').ignore().returning('name');
    if (inserted.length === 0) return false;

    const ids = new Map<string, string>();
    for (const a of DEMO_ACCOUNTS) {
      const [row] = await trx('users')
        .insert({
          email: a.email,
          name: a.name,
          role: a.role,
          organization: a.organization,
          password_hash: await hashPassword(a.password),
        })
        .onConflict('email')
        .merge(['name'])
        .returning('id');
      ids.set(a.email, row.id);
    }
    const trainerId = ids.get('trainer@kestrelvale.test')!;
    const [cohort] = await trx('cohorts')
      .insert({
        name: DEMO_COHORT,
        description: 'Evening class: wiring the operator panel, the start/stop handshake and its interlocks.',
        trainer_id: trainerId,
      })
      .returning('id');
    const students = DEMO_ACCOUNTS.filter((a) => a.role === 'student');
    await trx('memberships').insert(students.map((s) => ({ cohort_id: cohort.id, user_id: ids.get(s.email)! })));
    return true;
  });
}
