import { expect, test, type Locator, type Page } from '@playwright/test';
import { DEMO, pageFor } from './foundation-helpers';

/**
 * The rule builder in the browser: a lead builds an interlock rule on the demo changeover with
 * the signal pickers (search by name), on/off toggles and an "or" group, reads it back as a
 * sentence, runs the proofs (the job worker proves it) and sees its verdict, then opens the
 * counterexample of the interlock the change breaks. A trainer builds a drill's grading rule
 * and fault card with the same pickers, and the stored drill reads back the same.
 */

const DEMO_CHANGEOVER = 'Rear guard door and DI card to slot 6';
const BROKEN = 'Robot held whenever the yellow tier shows a guard open';

/** Types into a signal picker and chooses the option whose text matches. */
async function pick(page: Page, scope: Locator, picker: string, search: string, option: RegExp): Promise<void> {
  const box = scope.getByRole('combobox', { name: picker });
  await box.click();
  await box.fill(search);
  await page.getByRole('option', { name: option }).first().click();
}

type ChangeoverRow = { id: string; title: string; cellId: string; state: string; baseVersion: number };

/**
 * The demo changeover while it still takes proofs; once another spec has signed it off (the
 * changeover walk signs and rolls it back), a fresh one on the same cell with the same change:
 * the demo's proposal saved again as the latest version, base v1. Interlock rules belong to the
 * cell, so the new changeover proves the same list.
 */
async function openDemoChangeover(page: Page): Promise<string> {
  const list = (await (await page.request.get('/api/changeovers')).json()) as { changeovers: ChangeoverRow[] };
  const demo = list.changeovers.find((c) => c.title === DEMO_CHANGEOVER);
  if (!demo) throw new Error('the demo changeover is missing: seed the database');
  const open = list.changeovers.find((c) => c.cellId === demo.cellId && (c.state === 'drafting' || c.state === 'checked'));
  if (open) return open.id;
  const versions = (await (await page.request.get(`/api/cells/${demo.cellId}/versions`)).json()) as { versions: { version: number }[] };
  const proposal = (await (await page.request.get(`/api/cells/${demo.cellId}/versions/2`)).json()) as { version: { document: unknown } };
  const saved = await page.request.post(`/api/cells/${demo.cellId}/versions`, { data: { baseVersion: versions.versions[0].version, document: proposal.version.document, message: 'The rear door proposal again' } });
  expect(saved.status()).toBe(201);
  const made = await page.request.post('/api/changeovers', { data: { cellId: demo.cellId, baseVersion: 1, title: `${DEMO_CHANGEOVER} (second look)` } });
  expect(made.status()).toBe(201);
  return ((await made.json()) as { changeover: { id: string } }).changeover.id;
}

test('a lead builds an interlock rule with the pickers, sees its verdict and opens a counterexample', async ({ browser }) => {
  test.setTimeout(180_000);
  const page = await pageFor(browser, DEMO.lead);
  const id = await openDemoChangeover(page);
  await page.goto(`/changeovers/${id}`);
  const changeoverUrl = page.url();
  const proofs = page.getByTestId('proofs-section');
  await expect(proofs.getByTestId('proof-rule-0')).toContainText(BROKEN);

  // Build: never the red tier off while (the e-stop chain is open or the robot reports a fault).
  await proofs.getByTestId('add-interlock-rule').click();
  const form = page.getByTestId('interlock-rule-form');
  await form.getByLabel('Title').fill('Red tier whenever the e-stop chain is open or the robot faults');
  await expect(form.getByRole('radio', { name: /Never … while …/ })).toHaveAttribute('aria-checked', 'true');
  await pick(page, form, 'What: signal', 'red tier', /Cell status red tier.*%QX1\.0/);
  await form.getByRole('radiogroup', { name: 'What: on or off' }).getByRole('radio', { name: 'off' }).click();
  await pick(page, form, 'While: signal', 'emergency', /Emergency stop.*%IX0\.2/);
  await form.getByRole('radiogroup', { name: 'While: on or off' }).getByRole('radio', { name: 'off' }).click();
  await form.getByRole('button', { name: 'While: add an “or” condition' }).click();
  // Found by the wire it arrives on (l-fault), not by its address.
  await pick(page, form, 'While 2: signal', 'l-fault', /DO7 Fault.*%IX1\.6/);
  await expect(form.getByTestId('rule-sentence')).toHaveText('Never %QX1.0 (Cell status red tier) off while (%IX0.2 (Emergency stop) off or %IX1.6 (DO7 Fault) on)');
  await page.screenshot({ path: 'test-results/evidence-rule-builder.png', fullPage: true });
  await form.getByRole('button', { name: 'Add the rule' }).click();
  const ruleCard = (title: string) => proofs.getByTestId(/^proof-rule-\d+$/).filter({ hasText: title });
  const built = ruleCard('Red tier whenever the e-stop chain is open or the robot faults');
  await expect(built.getByTestId('proof-rule-sentence')).toContainText('%IX1.6 (DO7 Fault) on');

  // Prove: the worker runs the job; the verdicts arrive on both sides.
  await proofs.getByTestId('run-proofs').click();
  await expect(built.getByTestId('verdict-proposal').getByTestId('verdict-status')).toHaveText('proved', { timeout: 90_000 });
  await expect(built.getByTestId('verdict-base').getByTestId('verdict-status')).toHaveText('proved');
  const broken = ruleCard(BROKEN);
  await expect(broken.getByTestId('verdict-base').getByTestId('verdict-status')).toHaveText('proved');
  await expect(broken.getByTestId('verdict-proposal').getByTestId('verdict-status')).toHaveText('violated');
  await page.screenshot({ path: 'test-results/evidence-proofs.png', fullPage: true });

  // The counterexample plays on the proposal's cell, its failing scan marked.
  await broken.getByRole('link', { name: 'Open the counterexample' }).click();
  await page.waitForURL(/\/counterexample\/[0-9a-f-]{36}$/);
  await expect(page.getByTestId('counterexample-scans')).toBeVisible();
  await expect(page.getByTestId('failing-scan')).toContainText('rule broken');
  await expect(page.getByTestId('replay')).toBeVisible();
  await expect(page.getByTestId('scope-mark')).toBeVisible();
  await expect(page.getByTestId('scope-lane-%QX0.3')).toBeVisible();
  await page.screenshot({ path: 'test-results/evidence-counterexample.png', fullPage: true });

  // Leave the demo's rule list as it was.
  await page.goto(changeoverUrl);
  page.once('dialog', (d) => void d.accept());
  await page.getByTestId('proofs-section').getByRole('button', { name: 'Delete rule “Red tier whenever the e-stop chain is open or the robot faults”' }).click();
  await expect(page.getByTestId('proofs-section').getByTestId(/^proof-rule-\d+$/).filter({ hasText: 'Red tier whenever the e-stop chain is open or the robot faults' })).toHaveCount(0);
});

test('a trainer builds a drill’s grading rule and fault card from the cell instead of typing ids', async ({ browser }) => {
  test.setTimeout(120_000);
  const page = await pageFor(browser, DEMO.trainer);
  await page.goto('/drills/new');
  const title = `Builder drill ${Date.now().toString(36)}`;
  await page.getByLabel('Title').fill(title);
  const base = await page.getByLabel('Base cell').locator('option', { hasText: 'Kestrel Vale Cell B' }).first().getAttribute('value');
  await page.getByLabel('Base cell').selectOption(base!);

  const fault = page.getByTestId('fault-0');
  await fault.getByLabel('Kind').selectOption('stuck-off');
  // Only devices a stuck-off card applies to are offered (no pilot light).
  await expect(fault.getByLabel('Device').locator('option', { hasText: 'Robot ready' })).toHaveCount(0);
  await fault.getByLabel('Device').selectOption('guard');
  await fault.getByLabel('Appears').selectOption('when');
  await pick(page, fault, 'Fault card 1 trigger: signal', 'cycling', /Robot reports: cycling/);

  await page.getByRole('button', { name: 'Add rule' }).click();
  const rule = page.getByTestId('rule-0');
  await rule.getByLabel('Kind').selectOption('never');
  await pick(page, rule, 'Rule 1 condition: signal', 'arm moving', /Arm moving/);
  await rule.getByRole('button', { name: 'Rule 1 condition: add an “and” condition' }).click();
  await pick(page, rule, 'Rule 1 condition 2: signal', 'w-guard', /Front guard.*plc\.%IX0\.4/);
  await rule.getByRole('radiogroup', { name: 'Rule 1 condition 2: on or off' }).getByRole('radio', { name: 'off' }).click();
  await rule.getByRole('button', { name: 'Rule 1 condition 2: not' }).click();
  const sentence = 'Never (Arm moving (arm.moving) is on and not Front guard (plc.%IX0.4) is off)';
  await expect(rule.getByTestId('drill-rule-sentence')).toHaveText(sentence);

  await page.getByLabel('Fault kind (the answer)').selectOption('stuck-off');
  await page.getByLabel('Where (the answer)').selectOption('guard');
  await page.screenshot({ path: 'test-results/evidence-drill-builder.png', fullPage: true });
  await page.getByTestId('save-drill').click();
  await page.waitForURL(/\/drills\/[0-9a-f-]{36}$/);

  // Stored in the engine's format and read back into the same builder.
  await page.reload();
  await expect(page.getByTestId('rule-0').getByTestId('drill-rule-sentence')).toHaveText(sentence);
  await expect(page.getByTestId('fault-0').getByLabel('Device')).toHaveValue('guard');
  await expect(page.getByTestId('fault-0').getByRole('combobox', { name: 'Fault card 1 trigger: signal' })).toHaveValue(/cycling/);
});
