import { expect, test } from '@playwright/test';
import type { Page } from '@playwright/test';
import { DEMO, signInAs } from './foundation-helpers';

/** A fresh cell made through the API with the page's own session (so tests do not share state). */
async function newCell(page: Page, name: string): Promise<string> {
  const res = await page.request.post('/api/cells', { data: { name, template: 'pick-and-place' } });
  expect(res.status()).toBe(201);
  return ((await res.json()) as { cell: { id: string } }).cell.id;
}

async function versionCount(page: Page, id: string): Promise<number> {
  const res = await page.request.get(`/api/cells/${id}/versions`);
  return ((await res.json()) as { versions: unknown[] }).versions.length;
}

test('a point-map CSV with one bad row shows that row’s error and saves nothing', async ({ page }, testInfo) => {
  await signInAs(page, DEMO.trainer);
  const name = `CSV check ${Date.now()}`;
  const id = await newCell(page, name);

  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Cells', exact: true }).click();
  await page.waitForURL('**/cells');
  const row = page.locator(`[data-testid="cell-row"][data-cell-id="${id}"]`);
  await expect(row.getByRole('link', { name, exact: true })).toBeVisible();
  await expect(row.getByTestId('cell-version-count')).toHaveText('1');
  await page.screenshot({ path: testInfo.outputPath('cells-list.png'), fullPage: true });

  // Row 3 (the header is row 1) names rack "x": the only bad row among three (the demo's cards are in rack 1).
  const csv = [
    'row_id,family,first_point,count,rack,slot,first_channel,bits,encoding,labels,invert',
    'pm-di,DI,1,6,1,2,0,,,Start|Stop|Reset|Guard|E-stop|Part,',
    'pm-do,DO,1,7,x,3,0,,,,',
    'pm-to,TO,1,1,1,4,0,,,Gripper close,',
  ].join('\r\n');
  await row.getByRole('button', { name: `Import CSV into ${name}` }).click();
  const dialog = page.getByRole('dialog', { name: `Import CSV into “${name}”` });
  await dialog.getByLabel('Point map').check();
  await dialog.getByLabel('CSV file').setInputFiles({ name: 'point-map.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
  await dialog.getByRole('button', { name: 'Import' }).click();

  await expect(dialog.getByRole('alert')).toContainText('One row has problems; nothing was imported.');
  const errors = dialog.getByTestId('csv-row-error');
  await expect(errors).toHaveCount(1);
  await expect(errors.first()).toHaveAttribute('data-row', '3');
  await expect(errors.first()).toContainText('rack');
  await expect(errors.first()).toContainText('"x" is not a whole number');
  await page.screenshot({ path: testInfo.outputPath('cells-csv-errors.png') });

  expect(await versionCount(page, id)).toBe(1);
  await dialog.getByRole('button', { name: 'Cancel' }).click();
  await expect(row.getByTestId('cell-version-count')).toHaveText('1');
});

test('a student opens their own copy of a cell shared with their cohort', async ({ page }) => {
  await signInAs(page, DEMO.student);
  await page.goto('/cells');
  const shared = page.getByTestId('shared-cells');
  await expect(shared).toContainText('Kestrel Vale Cell B — pick and place');
  const open = shared.getByRole('button', { name: 'Open my copy of Kestrel Vale starter — start/stop with seal-in' });
  await open.click();
  await page.waitForURL(/\/cells\/[0-9a-f-]{36}$/);
  const copyUrl = page.url();
  await page.goto('/cells');
  await expect(page.getByTestId('shared-cells').getByRole('link', { name: 'Go to my copy' }).first()).toBeVisible();
  await expect(page.getByTestId('my-cells')).toContainText('my copy');
  expect(copyUrl).not.toContain('undefined');
});
