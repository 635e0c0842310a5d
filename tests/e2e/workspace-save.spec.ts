import { expect, test, type Page } from '@playwright/test';
import { newPickAndPlaceCell, signIn, STUDENT } from './workspace-helpers';

/** Renames the "Cycle start" button through the panel editor (edit mode). */
async function renameStartButton(page: Page, label: string) {
  await page.getByRole('button', { name: 'Edit layout' }).click();
  await page.getByTestId('plate-slot-start').click();
  const field = page.getByRole('form', { name: /^Edit / }).getByLabel('Label');
  await field.fill(label);
  await field.blur();
  await expect(page.getByTestId('version-label')).toContainText('unsaved changes');
}

async function saveWithMessage(page: Page, message: string) {
  await page.getByRole('button', { name: 'Save', exact: true }).click();
  await page.getByLabel('What changed?').fill(message);
  await page.getByRole('button', { name: 'Save version' }).click();
}

test('undo, redo and the autosaved draft survive a reload', async ({ page }) => {
  await signIn(page, STUDENT);
  const id = await newPickAndPlaceCell(page, `Draft check ${Date.now()}`);
  await page.goto(`/cells/${id}`);
  await expect(page.getByTestId('engine-status')).toHaveText('ready');

  await renameStartButton(page, 'Go now');
  await expect(page.getByTestId('plate-slot-start')).toContainText('Go now');
  await page.getByRole('button', { name: /^Undo/ }).click();
  await expect(page.getByTestId('plate-slot-start')).toContainText('Cycle start');
  // Ctrl+Shift+Z redoes (focus outside a text field).
  await page.getByTestId('front-plate').click({ position: { x: 5, y: 5 } });
  await page.keyboard.press('Control+Shift+Z');
  await expect(page.getByTestId('plate-slot-start')).toContainText('Go now');

  // The draft is written shortly after the edit (browser storage); a reload restores it with a notice.
  await expect
    .poll(() => page.evaluate(() => Object.keys(localStorage).filter((k) => k.startsWith('cellwright:draft:')).map((k) => localStorage.getItem(k) ?? '').join('')))
    .toContain('Go now');
  await page.reload();
  await expect(page.getByTestId('draft-notice')).toContainText('Restored your unsaved draft');
  await expect(page.getByTestId('plate-slot-start')).toContainText('Go now');
  await expect(page.getByTestId('version-label')).toContainText('unsaved changes');
});

test('two browsers edit the same cell: the second save gets the conflict and keeps its work as a copy', async ({ browser }) => {
  const first = await browser.newContext();
  const second = await browser.newContext();
  const a = await first.newPage();
  const b = await second.newPage();
  await signIn(a, STUDENT);
  await signIn(b, STUDENT);
  const name = `Conflict check ${Date.now()}`;
  const id = await newPickAndPlaceCell(a, name);
  await a.goto(`/cells/${id}`);
  await b.goto(`/cells/${id}`);
  await expect(a.getByTestId('version-label')).toContainText('version 1');
  await expect(b.getByTestId('version-label')).toContainText('version 1');

  await renameStartButton(a, 'Start from A');
  await renameStartButton(b, 'Start from B');

  await saveWithMessage(a, 'rename from A');
  await expect(a.getByTestId('version-label')).toHaveText('version 2');

  await saveWithMessage(b, 'rename from B');
  const dialog = b.getByTestId('conflict-dialog');
  await expect(dialog).toBeVisible();
  await expect(dialog).toContainText('A newer version was saved');
  await b.screenshot({ path: test.info().outputPath('conflict.png') });
  // B's work is still on screen while the dialog is open.
  await expect(b.getByTestId('plate-slot-start')).toContainText('Start from B');

  await dialog.getByRole('button', { name: 'Keep my work as a copy' }).click();
  await b.waitForURL((url) => url.pathname.startsWith('/cells/') && !url.pathname.endsWith(id));
  await expect(b.getByRole('heading', { level: 1 })).toHaveText(`${name} (my copy)`);
  await expect(b.getByTestId('plate-slot-start')).toContainText('Start from B');

  // A's save stands in the original cell.
  await a.reload();
  await expect(a.getByTestId('plate-slot-start')).toContainText('Start from A');
  await first.close();
  await second.close();
});

test('a wiring mistake is shown on its terminal-strip row; undo clears it', async ({ page }) => {
  await signIn(page, STUDENT);
  const id = await newPickAndPlaceCell(page, `Wiring check ${Date.now()}`);
  await page.goto(`/cells/${id}`);
  await expect(page.getByTestId('engine-status')).toHaveText('ready');
  await page.getByRole('tab', { name: 'Field' }).click();
  const from = page.getByLabel('w-start from');
  await expect(from).toHaveValue('start:contact');
  await from.fill('nowhere:contact');
  await from.press('Enter');
  await expect(page.getByTestId('engine-status')).toHaveText('invalid');
  await expect(page.getByTestId('wire-w-start-problem').first()).toBeVisible();
  await expect(page.getByTestId('engine-problems')).toBeVisible();
  await page.screenshot({ path: test.info().outputPath('field-problem.png'), fullPage: true });
  await page.getByRole('button', { name: /^Undo/ }).click();
  await expect(page.getByTestId('engine-status')).toHaveText('ready');
  await expect(page.getByTestId('wire-w-start-problem')).toHaveCount(0);
  await expect(from).toHaveValue('start:contact');
});

test('panel edit mode: add a device, move it by keyboard, change its colour', async ({ page }) => {
  await signIn(page, STUDENT);
  const id = await newPickAndPlaceCell(page, `Panel edit ${Date.now()}`);
  await page.goto(`/cells/${id}`);
  await expect(page.getByTestId('engine-status')).toHaveText('ready');
  await page.getByRole('button', { name: 'Edit layout' }).click();
  await page.getByLabel('Add a panel device').selectOption('pilot-light');
  await page.getByRole('button', { name: 'Add', exact: true }).click();
  const slot = page.getByTestId('plate-slot-pl1');
  await expect(slot).toBeVisible();
  const before = (await slot.boundingBox())!;
  await slot.focus();
  await page.keyboard.press('ArrowRight');
  await page.keyboard.press('ArrowRight');
  // Each arrow press moves the device 10 mm; the plate draws 1 mm as 1 px.
  await expect.poll(async () => Math.round((await slot.boundingBox())!.x - before.x)).toBe(20);
  await page.getByRole('form', { name: /^Edit / }).getByLabel('Colour').selectOption('yellow');
  await expect(page.getByTestId('lamp-pl1').getByRole('img')).toHaveAttribute('aria-label', /yellow lamp off/);
  await page.screenshot({ path: test.info().outputPath('panel-edit.png'), fullPage: true });
  await page.getByRole('button', { name: 'Editing layout' }).click();
  await expect(page.getByLabel('Add a panel device')).toHaveCount(0);
});
