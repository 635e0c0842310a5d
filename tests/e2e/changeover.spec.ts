import { readFile } from 'node:fs/promises';
import { expect, test, type Locator, type Page } from '@playwright/test';
import { DEMO, mainNav, pageFor } from './foundation-helpers';

/**
 * Issue 10 end to end, on the demo changeover (db/seeds/demo-changeovers.ts): the plant's lead
 * opens it, reads the diff and the marked logic sheet, downloads the I/O change sheet, pins the
 * proposal, runs the proofs and scenario checks (jobs on the worker), accepts what the change
 * breaks with written reasons and signs; the shift lead countersigns; the signed record prints;
 * the lead rolls the change back and the cell gets a new version.
 */
const SHIFT_LEAD = { email: 'shift.lead@brennick.test', password: 'lead-demo-2026', name: 'Kasimir Thorne' } as const;
const TITLE = 'Rear guard door and DI card to slot 6';
const SHOTS = process.env.E2E_SHOTS_DIR;

/** Screenshots for a person to look at (E2E_SHOTS_DIR set): the page, or one part of it. */
async function shot(page: Page, name: string, part?: Locator): Promise<void> {
  if (!SHOTS) return;
  if (part) await part.screenshot({ path: `${SHOTS}/${name}.png` });
  else await page.screenshot({ path: `${SHOTS}/${name}.png`, fullPage: true });
}

/** Accepts, one by one, everything the page offers to accept (violations and changed outcomes). */
async function acceptAll(page: Page, section: string, reason: string): Promise<number> {
  const region = page.getByRole('region', { name: section, exact: true });
  let n = 0;
  for (;;) {
    const offer = region.getByRole('button', { name: 'Accept with a reason…' }).first();
    if ((await offer.count()) === 0) return n;
    await offer.click();
    await region.getByRole('textbox', { name: /acceptable\?/ }).fill(reason);
    const before = await region.getByTestId('acceptance').count();
    await region.getByRole('button', { name: 'Accept', exact: true }).click();
    await expect(region.getByTestId('acceptance')).toHaveCount(before + 1);
    n++;
  }
}

test('the lead diffs, proves, signs and rolls back the demo changeover; a second person countersigns', async ({ browser }) => {
  test.setTimeout(240_000);

  // The lead finds the demo changeover in their list.
  const lead = await pageFor(browser, DEMO.lead);
  await expect(lead.getByTestId('dashboard-changeovers')).toContainText(TITLE);
  await mainNav(lead).getByRole('link', { name: 'Changeovers' }).click();
  await lead.waitForURL('**/changeovers');
  await expect(lead.getByTestId('safety-caution')).toBeVisible();
  const row = lead.getByTestId('changeover-row').filter({ hasText: TITLE });
  await expect(row.getByTestId('changeover-state')).toHaveText('Drafting');
  await shot(lead, 'changeovers-list');
  await row.getByRole('link', { name: TITLE }).click();
  await lead.waitForURL(/\/changeovers\/[0-9a-f-]{36}$/);
  const changeoverUrl = lead.url();
  await expect(lead.getByRole('heading', { level: 1 })).toHaveText(TITLE);
  await expect(lead.getByTestId('changeover-caution')).toContainText('A proof covers the modelled logic only');

  // The diff, area by area, in words.
  const devices = lead.getByTestId('diff-area-devices');
  await expect(devices.locator('[data-id="rearGuard"]')).toContainText('added');
  await expect(devices.locator('[data-id="rearGuard"]')).toContainText('guard-switch “Rear guard door” (NC)');
  const wire = lead.getByTestId('diff-area-wiring').locator('[data-id="l-guard"]');
  await expect(wire).toContainText('re-terminated');
  await expect(wire).toContainText('to: rack 1 / slot 2 / ch 3');
  await expect(wire).toContainText('to: rack 1 / slot 6 / ch 3');
  await expect(lead.getByTestId('diff-area-pointMap').locator('[data-id="pm-di"]')).toContainText('live map');

  // The marked logic sheet: new and changed blocks carry a worded badge; the list jumps to each.
  const canvas = lead.getByTestId('diff-canvas');
  await lead.getByTestId('logic-diff').scrollIntoViewIfNeeded();
  await lead.getByTestId('logic-change-guardsClosed').click();
  await expect(canvas).toHaveAttribute('data-focus', 'proposed:guardsClosed');
  await expect(lead.getByTestId('diff-block-guardsClosed')).toHaveAttribute('data-mark', 'new');
  await expect(lead.getByTestId('diff-block-guardsClosed')).toContainText('new');
  await lead.getByTestId('logic-change-yellowNeeded').click();
  await expect(canvas).toHaveAttribute('data-focus', 'proposed:yellowNeeded');
  await expect(lead.getByTestId('diff-block-yellowNeeded')).toHaveAttribute('data-mark', 'changed');
  await lead.getByTestId('logic-change-c6').click();
  await expect(canvas).toHaveAttribute('data-focus', 'proposed:c6');
  await expect(lead.getByTestId('diff-wire-c6')).toHaveText('re-pointed');
  await lead.getByRole('button', { name: 'Base v1' }).click();
  await expect(canvas).toHaveAttribute('data-side', 'base');
  await expect(lead.getByTestId('diff-block-yellowNeeded')).toHaveAttribute('data-mark', 'changed');
  await lead.getByRole('button', { name: /^Proposed v/ }).click();
  await lead.getByTestId('logic-change-guardsClosed').click();
  await shot(lead, 'changeover-drafting');
  await shot(lead, 'part-panel', lead.getByTestId('changeover-panel'));
  await shot(lead, 'part-logic', lead.getByTestId('logic-diff'));
  await shot(lead, 'part-wiring', lead.getByTestId('diff-area-wiring'));

  // The I/O change sheet for the electricians.
  const download = lead.waitForEvent('download');
  await lead.getByTestId('io-sheet-download').click();
  const file = await download;
  expect(file.suggestedFilename()).toMatch(/-io-changes-v1-to-v2\.csv$/);
  const csv = await readFile((await file.path())!, 'utf8');
  expect(csv.split('\r\n')[0]).toBe('Action,Point / address,Label,Was,Now,Map,Wire,Source');
  expect(csv).toContain('move,DI4,Guard closed,rack 1 / slot 2 / ch 3,rack 1 / slot 6 / ch 3,live,,pointMap:pm-di');
  expect(csv).toContain('add,%IX0.7,Rear guard door');

  // Not ready yet, and the page says why.
  await expect(lead.getByTestId('signoff-blockers')).toContainText('not pinned');
  await expect(lead.getByTestId('sign-form').getByRole('button', { name: 'Sign the changeover' })).toBeDisabled();

  // Pin, then the proofs and the scenario checks run as jobs on the worker.
  await lead.getByTestId('pin-proposal').click();
  await expect(lead.getByTestId('changeover-state').first()).toHaveText('Under check');
  await lead.getByTestId('run-proofs').click();
  await lead.getByTestId('run-checks').click();
  await expect(lead.getByTestId('run-proofs')).toHaveText(/Run the proofs again/, { timeout: 90_000 });
  await expect(lead.getByTestId('run-checks')).toHaveText(/Run the checks again/, { timeout: 90_000 });
  await expect(lead.getByTestId('signoff-blockers')).toContainText('Robot held whenever the yellow tier shows a guard open');

  // What the change breaks is accepted in writing (the rear-door hold is re-wired next week).
  const reason = 'The rear door is passed to the robot in the follow-up change on Monday; until then the door is locked shut.';
  expect(await acceptAll(lead, 'Proofs', reason)).toBeGreaterThan(0);
  await acceptAll(lead, 'Scenario checks', reason);
  await expect(lead.getByTestId('signoff-ready')).toBeVisible({ timeout: 20_000 });
  await shot(lead, 'changeover-ready');
  await shot(lead, 'part-panel-ready', lead.getByTestId('changeover-panel'));

  // The lead signs with their name.
  await lead.getByTestId('sign-form').getByRole('textbox').fill(DEMO.lead.name);
  await lead.getByTestId('sign-form').getByRole('button', { name: 'Sign the changeover' }).click();
  await expect(lead.getByTestId('changeover-state').first()).toHaveText('Awaiting countersignature');
  await expect(lead.getByTestId('signature-line')).toContainText(`Signed by ${DEMO.lead.name}`);
  await expect(lead.getByTestId('countersign-form')).toHaveCount(0);

  // The shift lead, asked to countersign, finds it in their own list and countersigns.
  const shift = await pageFor(browser, SHIFT_LEAD);
  await mainNav(shift).getByRole('link', { name: 'Changeovers' }).click();
  await shift.getByTestId('changeover-row').filter({ hasText: TITLE }).getByRole('link', { name: TITLE }).click();
  await expect(shift.getByTestId('changeover-state').first()).toHaveText('Awaiting countersignature');
  await expect(shift.getByTestId('signoff-ready')).toBeVisible();
  await shift.getByTestId('countersign-form').getByRole('textbox').fill(SHIFT_LEAD.name);
  await shift.getByTestId('countersign-form').getByRole('button', { name: 'Countersign' }).click();
  await expect(shift.getByTestId('changeover-state').first()).toHaveText('Signed off');
  // The printed report (PDF): made by the job worker after the countersignature, downloaded through the app.
  const [pdf] = await Promise.all([shift.waitForEvent('download', { timeout: 30_000 }), shift.getByTestId('download-report').click()]);
  expect(pdf.suggestedFilename()).toMatch(/^changeover-[\w-]+\.pdf$/);
  expect((await readFile((await pdf.path())!)).subarray(0, 5).toString('latin1')).toBe('%PDF-');

  // The signed record: caution, both hashes, the accepted reason, both signatures.
  await shift.getByTestId('open-record').click();
  await shift.waitForURL(/\/record$/);
  const record = shift.getByTestId('signed-record');
  await expect(record.getByTestId('changeover-caution')).toBeVisible();
  await expect(record.getByTestId('base-sha256')).toHaveText(/^[0-9a-f]{64}$/);
  await expect(record.getByTestId('proposed-sha256')).toHaveText(/^[0-9a-f]{64}$/);
  await expect(record).toContainText(reason);
  await expect(record.getByTestId('record-signed-by')).toContainText(DEMO.lead.name);
  await expect(record.getByTestId('record-countersigned-by')).toContainText(SHIFT_LEAD.name);
  await shift.emulateMedia({ media: 'print' });
  await expect(shift.getByTestId('print-record')).toBeHidden();
  await shot(shift, 'changeover-record-print');
  await shot(shift, 'part-record', record);
  await shift.context().close();

  // Monday: the lead rolls back; the cell gets a new version that is the base again.
  await lead.goto(changeoverUrl);
  await expect(lead.getByTestId('changeover-state').first()).toHaveText('Signed off');
  await lead.getByTestId('rollback-open').click();
  const dialog = lead.getByRole('dialog', { name: 'Roll back this changeover?' });
  await expect(dialog).toContainText('v3');
  await dialog.getByTestId('rollback-confirm').click();
  await expect(lead.getByTestId('changeover-state').first()).toHaveText('Rolled back');
  await expect(lead.getByTestId('rollback-line')).toContainText('v3');
  await expect(lead.getByTestId('changeover-history')).toContainText('rolled back: v3 restores base v1');
  await shot(lead, 'changeover-rolled-back');
});

test('a trainer opens a changeover on a cell of their own for a class, and abandons it', async ({ browser }) => {
  const trainer = await pageFor(browser, DEMO.trainer);
  await mainNav(trainer).getByRole('link', { name: 'Changeovers' }).click();
  await trainer.getByTestId('open-changeover').click();
  const dialog = trainer.getByRole('dialog', { name: 'Open a changeover' });
  await dialog.getByLabel('Cell').selectOption({ label: 'Kestrel Vale Cell B — pick and place' });
  await expect(dialog.getByLabel('Base — the version that runs today')).toHaveValue('1');
  await dialog.getByLabel('Title').fill('Class example: lengthen the start pulse');
  await dialog.getByLabel('What changes and why').fill('Show the class how a parameter change reads in the diff.');
  await shot(trainer, 'open-dialog', dialog);
  await dialog.getByRole('button', { name: 'Open changeover' }).click();
  await trainer.waitForURL(/\/changeovers\/[0-9a-f-]{36}$/);
  await expect(trainer.getByRole('heading', { level: 1 })).toHaveText('Class example: lengthen the start pulse');
  await expect(trainer.getByTestId('changeover-state').first()).toHaveText('Drafting');
  // Nothing edited yet: nothing to pin, and the diff says so.
  await expect(trainer.getByTestId('pin-proposal')).toBeDisabled();
  await expect(trainer.getByTestId('proposal-section')).toContainText('still the base');
  await trainer.getByTestId('rollback-open').click();
  const confirm = trainer.getByRole('dialog', { name: 'Abandon this proposal?' });
  await expect(confirm).toContainText('nothing is restored');
  await confirm.getByTestId('rollback-confirm').click();
  await expect(trainer.getByTestId('changeover-state').first()).toHaveText('Abandoned');
  await expect(trainer.getByTestId('rollback-line')).toContainText('no version was needed');
});
