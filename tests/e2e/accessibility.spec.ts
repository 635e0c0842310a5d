import AxeBuilder from '@axe-core/playwright';
import { expect, test, type APIResponse, type Browser, type Page } from '@playwright/test';
import { DEMO, DEMO_COHORT, pageFor } from './foundation-helpers';
import { DEMO_CELL_NAME } from './workspace-helpers';

/*
 * Issue 12, "Accessible and usable anywhere": every page of the app, and every area of the cell
 * workspace, checked in Chromium with axe-core against WCAG 2 A and AA (axe's `wcag2a` and
 * `wcag2aa` tags: WCAG 2.0/2.1 success criteria at levels A and AA), as each role sees it. The
 * check is zero violations; a failure prints each one (rule, element, what is wrong) for every
 * page of the test, not only the first.
 *
 * Routes (app/**): public — /, /sign-in, /forgot-password, /reset-password/[token],
 * /invite/[token], a not-found page; signed in — /dashboard, /cells, /cells/[id] (six areas),
 * /runs/practice/[cellId], /drills, /drills/new, /drills/[id], /drills/[id]/preview,
 * /drills/assignments/[id] and …/live, /gradebook, /runs, /runs/[id], /runs/[id]/replay, /cohorts,
 * /cohorts/[id], /changeovers, /changeovers/[id], …/counterexample/[verdictId], /plc-link,
 * /plc-link/[id], /admin/users, /admin/mailbox, and /changeovers/[id]/record once a changeover
 * of the lead's own is signed and countersigned (the demo changeover is left to the other specs).
 *
 * A student attempt starts a run: this file uses Noor (a demo student no other spec signs in as),
 * so the live board's and the drill flow's expectations about Ada stay true.
 */

const NOOR = { email: 'noor.achterberg@kestrelvale.test', password: 'student-demo-2026' };
const SHIFT_LEAD = { email: 'shift.lead@brennick.test', password: 'lead-demo-2026' };
/** This spec's Modbus TCP port for a PLC link (plc-link.spec.ts uses 15036, integration tests 15020–15039). */
const PLC_PORT = 15046;

/** Runs axe over the page as it stands and records every WCAG 2 A/AA violation as a soft failure. */
async function checkPage(page: Page, label: string): Promise<void> {
  const results = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa']).analyze();
  const found = results.violations.flatMap((v) =>
    v.nodes.map((n) => `${v.id} (${v.impact ?? 'n/a'}) ${v.help}\n    at ${n.target.join(' ')}\n    ${(n.failureSummary ?? '').replace(/\n/g, '\n    ')}`),
  );
  expect.soft(found, `axe WCAG 2 A/AA violations on ${label} (${page.url()}):\n${found.join('\n')}`).toEqual([]);
}

type VisitOptions = {
  /** Waits for the page's own state before the check (default: its first level-1 heading). */
  ready?: (page: Page) => Promise<void>;
  /** The page models e-stops, guards or interlocks: exactly one full safety caution (DESIGN.md, Safety). */
  caution?: boolean;
};

/** A page carries the safety caution at most once, and where it must, once and in full. */
async function checkCaution(page: Page, label: string, required: boolean): Promise<void> {
  const cautions = page.getByTestId('safety-caution');
  const count = await cautions.count();
  if (required) {
    expect.soft(count, `${label}: one safety caution`).toBe(1);
    if (count === 1) await expect.soft(cautions, `${label}: the caution defers to local codes and licensed practice`).toContainText('local codes and licensed practice take precedence');
  } else {
    expect.soft(count, `${label}: at most one safety caution`).toBeLessThanOrEqual(1);
  }
}

/** Opens a path, waits for it to show, then checks it. */
async function visit(page: Page, path: string, label: string, { ready, caution = false }: VisitOptions = {}): Promise<void> {
  const response = await page.goto(path);
  expect(response?.status(), `${label} answers`).toBeLessThan(500);
  if (ready) await ready(page);
  else await expect(page.getByRole('heading', { level: 1 }).first()).toBeVisible();
  await checkCaution(page, label, caution);
  await checkPage(page, label);
}

const AREAS = ['Panel', 'Field', 'Logic', 'Controller', 'Monitor', 'Scope'] as const;

/** Each of the six workspace areas selected in turn, checked (and its caution counted) once it shows. */
async function checkAreas(page: Page, label: string): Promise<void> {
  for (const name of AREAS) {
    await page.getByRole('tab', { name }).click();
    await expect(page.getByRole('tab', { name })).toHaveAttribute('aria-selected', 'true');
    await expect(page.getByTestId(`area-${name.toLowerCase()}`)).toBeVisible();
    // Every workspace models e-stops, guards and interlocks: one full caution whichever area shows.
    await checkCaution(page, `${label}, ${name} area`, true);
    await checkPage(page, `${label}, ${name} area`);
  }
}

/** The answer has the status; its body is shown when not. */
async function expectStatus(res: APIResponse, status: number, what: string): Promise<void> {
  expect(res.status(), `${what}: ${res.status() === status ? '' : await res.text()}`).toBe(status);
}

async function json<T>(page: Page, path: string): Promise<T> {
  const res = await page.request.get(path);
  expect(res.ok(), `GET ${path}`).toBe(true);
  return (await res.json()) as T;
}

/** The newest captured mail to `to` whose text carries a link to `linkPath`; read through the admin's mailbox API. */
async function mailedLink(browser: Browser, to: string, linkPath: RegExp): Promise<string> {
  const admin = await pageFor(browser, DEMO.admin);
  let link = '';
  await expect
    .poll(
      async () => {
        const { messages } = await json<{ messages: { id: string; toHeader: string }[] }>(admin, '/api/admin/mail');
        const hit = messages.find((m) => m.toHeader.includes(to));
        if (!hit) return '';
        const { message } = await json<{ message: { textBody: string } }>(admin, `/api/admin/mail/${hit.id}`);
        link = message.textBody.match(new RegExp(`https?://\\S*${linkPath.source}`))?.[0] ?? '';
        return link;
      },
      { timeout: 15_000 },
    )
    .not.toBe('');
  await admin.context().close();
  return new URL(link).pathname;
}

const strip = (p: Page) => expect(p.getByTestId('status-strip')).toBeVisible();

test('public pages: landing, sign-in, forgot password, reset and invitation links, not found', async ({ browser, page }) => {
  await visit(page, '/', 'the landing page', { caution: true });
  await visit(page, '/sign-in', 'sign-in');
  await visit(page, '/forgot-password', 'forgot password');
  await visit(page, '/no-such-page-anywhere', 'not found');
  const problem = (p: Page) => expect(p.getByTestId('link-problem')).toBeVisible();
  await visit(page, '/invite/not-a-real-token-but-well-formed-0000', 'an invitation link that does not exist', { ready: problem });
  await visit(page, '/reset-password/not-a-real-token-but-well-formed-0000', 'a reset link that does not exist', { ready: problem });

  // A real invitation: the trainer invites an address; the link from the caught mail opens the form.
  const trainer = await pageFor(browser, DEMO.trainer);
  const { cohorts } = await json<{ cohorts: { id: string; name: string }[] }>(trainer, '/api/cohorts');
  const cohort = cohorts.find((c) => c.name === DEMO_COHORT)!;
  const invitee = `axe.${Date.now().toString(36)}@example.test`;
  const invited = await trainer.request.post(`/api/cohorts/${cohort.id}/invitations`, { data: { emails: [invitee] } });
  expect(invited.ok()).toBe(true);
  await trainer.context().close();
  await visit(page, await mailedLink(browser, invitee, /\/invite\/[A-Za-z0-9_-]+/), 'an invitation link', {
    ready: (p) => expect(p.getByRole('heading', { name: 'Create your account' })).toBeVisible(),
  });

  // A real reset link (never used, so the account keeps its password).
  const reset = await page.request.post('/api/password-resets', { data: { email: SHIFT_LEAD.email } });
  expect(reset.status()).toBe(202);
  await visit(page, await mailedLink(browser, SHIFT_LEAD.email, /\/reset-password\/[A-Za-z0-9_-]+/), 'a password reset link', {
    ready: (p) => expect(p.getByRole('textbox', { name: 'New password' })).toBeVisible(),
  });
});

test('a student: dashboard, cells, the shared cell workspace, practice, drills, an attempt, runs, result and replay', async ({ browser }) => {
  test.setTimeout(180_000);
  const page = await pageFor(browser, NOOR);
  await checkCaution(page, 'the student dashboard', false);
  await checkPage(page, 'the student dashboard');
  await visit(page, '/cells', 'cells (student)');
  const { shared } = await json<{ shared: { id: string; name: string }[] }>(page, '/api/cells');
  const cell = shared.find((c) => c.name === DEMO_CELL_NAME)!;
  await visit(page, `/cells/${cell.id}`, 'the shared cell workspace (run only)', { ready: strip, caution: true });
  await checkAreas(page, 'the shared cell workspace');
  await visit(page, `/runs/practice/${cell.id}`, 'a practice run', { ready: strip, caution: true });
  await checkAreas(page, 'a practice run');

  await visit(page, '/drills', 'my drills');
  await visit(page, '/runs', 'my runs');
  const { runs } = await json<{ runs: { id: string; status: string; mode: string }[] }>(page, '/api/runs');
  const graded = runs.find((r) => r.mode === 'drill' && r.status !== 'active')!;
  await visit(page, `/runs/${graded.id}`, 'a run result (student)');
  await visit(page, `/runs/${graded.id}/replay`, 'a replay (student)', { ready: (p) => expect(p.getByTestId('replay')).toBeVisible(), caution: true });

  const { assignments } = await json<{ assignments: { id: string; state: string }[] }>(page, '/api/assignments');
  const open = assignments.find((a) => a.state === 'open')!;
  await visit(page, `/drills/assignments/${open.id}`, 'a drill attempt', { ready: (p) => expect(p.getByTestId('saving-state')).toBeVisible({ timeout: 30_000 }), caution: true });
  await checkAreas(page, 'a drill attempt');
  await page.context().close();
});

test('a trainer: dashboard, own cell in all six areas, drills, editor, preview, live board, gradebook, runs, cohorts, PLC link', async ({ browser }) => {
  test.setTimeout(180_000);
  const page = await pageFor(browser, DEMO.trainer);
  await checkCaution(page, 'the trainer dashboard', false);
  await checkPage(page, 'the trainer dashboard');
  await visit(page, '/cells', 'cells (trainer)');
  const { cells } = await json<{ cells: { id: string; name: string }[] }>(page, '/api/cells');
  const own = cells.find((c) => c.name === DEMO_CELL_NAME) ?? cells[0];
  await visit(page, `/cells/${own.id}`, 'an own cell workspace', { ready: strip, caution: true });
  await checkAreas(page, 'an own cell workspace');
  await page.getByRole('button', { name: 'Edit layout' }).click();
  await checkAreas(page, 'an own cell workspace in layout editing');

  await visit(page, '/drills', 'drills (trainer)');
  await visit(page, '/drills/new', 'a new drill', { caution: true });
  const { drills } = await json<{ drills: { id: string; title: string }[] }>(page, '/api/drills');
  await visit(page, `/drills/${drills[0].id}`, 'the drill editor', { caution: true });
  await visit(page, `/drills/${drills[0].id}/preview`, 'a drill preview', { ready: strip, caution: true });
  await checkAreas(page, 'a drill preview');

  const { assignments } = await json<{ assignments: { id: string; state: string }[] }>(page, '/api/assignments');
  const open = assignments.find((a) => a.state === 'open')!;
  const closed = assignments.find((a) => a.state === 'closed')!;
  await visit(page, `/drills/assignments/${open.id}/live`, 'the live board', { ready: (p) => expect(p.getByTestId('live-tile').first()).toBeVisible(), caution: true });
  await visit(page, `/drills/assignments/${closed.id}/live`, 'what the cohort found (closed drill)', { caution: true });
  await visit(page, '/gradebook', 'the gradebook');

  await visit(page, '/cohorts', 'cohorts');
  const { cohorts } = await json<{ cohorts: { id: string; name: string }[] }>(page, '/api/cohorts');
  const cohort = cohorts.find((c) => c.name === DEMO_COHORT)!;
  await visit(page, `/cohorts/${cohort.id}`, 'a cohort');

  // A student's submitted run of the closed demo drill, found through the gradebook.
  const { gradebook } = await json<{ gradebook: { rows: { cells: Record<string, { runId: string; status: string } | null> }[] } }>(page, `/api/gradebook?cohort=${cohort.id}`);
  const graded = gradebook.rows.flatMap((r) => Object.values(r.cells)).find((c) => c?.status === 'submitted')!;
  await visit(page, `/runs/${graded.runId}`, 'a run result (trainer)');
  await visit(page, `/runs/${graded.runId}/replay`, 'a replay (trainer, hidden parts shown)', { ready: (p) => expect(p.getByTestId('replay')).toBeVisible(), caution: true });

  await visit(page, '/changeovers', 'changeovers (trainer)', { caution: true });

  await visit(page, '/plc-link', 'PLC link', { caution: true });
  const started = await page.request.post('/api/plc-links', { data: { cellId: own.id, port: PLC_PORT, linkTimeoutMs: 1000 } });
  expect(started.status()).toBe(201);
  const { session } = (await started.json()) as { session: { id: string } };
  try {
    await visit(page, `/plc-link/${session.id}`, 'a PLC link session', { ready: (p) => expect(p.getByTestId('plc-link-state')).toHaveText('Waiting for the PLC'), caution: true });
  } finally {
    expect((await page.request.delete(`/api/plc-links/${session.id}`)).ok()).toBe(true);
  }
  await page.context().close();
});

type ChangeoverRow = { id: string; title: string; cellId: string; baseVersion: number; proposedVersion: number };

/** The seeded demo changeover of the lead (the one this spec did not open). */
async function demoChangeover(page: Page): Promise<ChangeoverRow> {
  const { changeovers } = await json<{ changeovers: ChangeoverRow[] }>(page, '/api/changeovers');
  const demo = changeovers.find((c) => !c.title.startsWith(OWN_CHANGEOVER));
  expect(demo, 'the demo changeover is seeded').toBeTruthy();
  return demo!;
}

const OWN_CHANGEOVER = 'Accessibility check';

/**
 * A changeover of the lead's own, never the demo one (other specs walk that one from drafting to
 * sign-off): a copy of the demo cell at its base version, the demo's proposal saved on top and
 * the cell's interlock rules copied, so its proofs find the same violation.
 */
async function ownChangeover(page: Page): Promise<{ id: string; cellId: string }> {
  const demo = await demoChangeover(page);
  const base = await json<{ version: { document: unknown } }>(page, `/api/cells/${demo.cellId}/versions/${demo.baseVersion}`);
  const proposal = await json<{ version: { document: unknown } }>(page, `/api/cells/${demo.cellId}/versions/${demo.proposedVersion}`);
  const imported = await page.request.post('/api/cells/import', { data: { name: `Accessibility check ${Date.now().toString(36)}`, document: base.version.document } });
  expect(imported.status()).toBe(201);
  const cellId = ((await imported.json()) as { cell: { id: string } }).cell.id;
  const saved = await page.request.post(`/api/cells/${cellId}/versions`, { data: { baseVersion: 1, document: proposal.version.document, message: 'The rear door proposal' } });
  expect(saved.status()).toBe(201);
  const { rules } = await json<{ rules: { title: string; body: Record<string, unknown> }[] }>(page, `/api/cells/${demo.cellId}/interlock-rules`);
  for (const r of rules) expect((await page.request.post(`/api/cells/${cellId}/interlock-rules`, { data: { title: r.title, rule: r.body } })).status()).toBe(201);
  const made = await page.request.post('/api/changeovers', { data: { cellId, baseVersion: 1, title: `${OWN_CHANGEOVER}: the demo change` } });
  expect(made.status()).toBe(201);
  return { id: ((await made.json()) as { changeover: { id: string } }).changeover.id, cellId };
}

type EvidenceAnswer = {
  evidence: { ready: boolean; runs: { proofs: unknown }; open: { proofs: unknown }; proofs: { proposed: { verdictId: string; status: string } | null }[] };
};

test('a maintenance lead and a countersigner: changeovers, a changeover with its verdicts, a counterexample, the signed record', async ({ browser }) => {
  test.setTimeout(300_000);
  const page = await pageFor(browser, DEMO.lead);
  await checkCaution(page, 'the lead dashboard', true);
  await checkPage(page, 'the lead dashboard');
  await visit(page, '/cells', 'cells (lead)');
  await visit(page, '/changeovers', 'changeovers (lead)', { caution: true });
  await visit(page, `/changeovers/${(await demoChangeover(page)).id}`, 'the demo changeover', { caution: true });

  // Pinned and proved: the change breaks one of the cell's rules, so there is a counterexample.
  const co = await ownChangeover(page);
  await expectStatus(await page.request.post(`/api/changeovers/${co.id}/pin`), 200, 'pin');
  await expectStatus(await page.request.post(`/api/changeovers/${co.id}/proofs`), 202, 'run the proofs');
  await expect
    .poll(async () => {
      const { evidence } = await json<EvidenceAnswer>(page, `/api/changeovers/${co.id}/evidence`);
      return evidence.runs.proofs !== null && evidence.open.proofs === null;
    }, { timeout: 150_000 })
    .toBe(true);
  await visit(page, `/changeovers/${co.id}`, 'a changeover with its verdicts', { caution: true });
  await page.getByRole('link', { name: 'Open the counterexample' }).first().click();
  await page.waitForURL(/\/counterexample\/[0-9a-f-]{36}$/);
  await expect(page.getByTestId('counterexample-scans')).toBeVisible();
  await checkCaution(page, 'a counterexample', true);
  await checkPage(page, 'a counterexample');

  // Accepted in writing, signed, countersigned by the admin: the record exists.
  const { evidence } = await json<EvidenceAnswer>(page, `/api/changeovers/${co.id}/evidence`);
  for (const p of evidence.proofs) {
    if (p.proposed && (p.proposed.status === 'violated' || p.proposed.status === 'undecided')) {
      const accepted = await page.request.put(`/api/changeovers/${co.id}/verdicts/${p.proposed.verdictId}/acceptance`, { data: { reason: 'Accepted for the accessibility check: a rehearsal only.' } });
      await expectStatus(accepted, 200, 'accept a violation');
    }
  }
  await expect.poll(async () => (await json<EvidenceAnswer>(page, `/api/changeovers/${co.id}/evidence`)).evidence.ready).toBe(true);
  const versions = { baseVersion: 1, proposedVersion: 2 };
  await expectStatus(await page.request.post(`/api/changeovers/${co.id}/sign`, { data: { ...versions, confirmName: DEMO.lead.name } }), 200, 'sign');
  await visit(page, '/plc-link', 'PLC link (lead)', { caution: true });
  await page.context().close();

  const admin = await pageFor(browser, DEMO.admin);
  await expectStatus(await admin.request.post(`/api/changeovers/${co.id}/countersign`, { data: { ...versions, confirmName: DEMO.admin.name } }), 201, 'countersign');
  await visit(admin, `/changeovers/${co.id}`, 'a signed-off changeover', { caution: true });
  await visit(admin, `/changeovers/${co.id}/record`, 'the signed record', { ready: (p) => expect(p.getByTestId('signed-record')).toBeVisible(), caution: true });
  await admin.context().close();
});

test('the shift lead and the admin: dashboards, changeovers, users, mailbox, cohorts', async ({ browser }) => {
  const shift = await pageFor(browser, SHIFT_LEAD);
  await checkPage(shift, 'the shift lead dashboard');
  await visit(shift, '/changeovers', 'changeovers (shift lead)', { caution: true });
  await shift.context().close();

  const admin = await pageFor(browser, DEMO.admin);
  await checkPage(admin, 'the admin dashboard');
  await visit(admin, '/admin/users', 'users');
  await visit(admin, '/admin/mailbox', 'the mailbox');
  await admin.getByRole('button', { name: /to / }).first().click();
  await expect(admin.getByRole('article', { name: 'Message' })).toBeVisible();
  await checkPage(admin, 'the mailbox with a message open');
  await visit(admin, '/cohorts', 'cohorts (admin)');
  await visit(admin, '/changeovers', 'changeovers (admin)', { caution: true });
  await admin.context().close();
});
