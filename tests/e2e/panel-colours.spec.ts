import { expect, test } from '@playwright/test';
import { newPickAndPlaceCell, signIn, STUDENT } from './workspace-helpers';

// IEC 60204-1 §10.2.1 (from memory): a START button is never red. The engine warns; the cell runs anyway.
test('a start button coloured red gets the engine\'s IEC 60204-1 warning in the panel editor, and loses it when green again', async ({ page }) => {
  await signIn(page, STUDENT);
  const id = await newPickAndPlaceCell(page, `Colour check ${Date.now()}`);
  await page.goto(`/cells/${id}`);
  await expect(page.getByTestId('engine-status')).toHaveText('ready');
  await expect(page.getByTestId('panel-warnings')).toHaveCount(0);

  await page.getByRole('button', { name: 'Edit layout' }).click();
  await page.getByTestId('plate-slot-start').click();
  const form = page.getByRole('form', { name: /^Edit / });
  await expect(form.getByLabel('Function')).toHaveValue('start');
  await form.getByLabel('Colour').selectOption('red');
  await expect(page.getByTestId('panel-warnings')).toContainText('start button "start" must not be red (IEC 60204-1 §10.2.1)');
  await expect(page.getByTestId('engine-status')).toHaveText('ready');

  await form.getByLabel('Colour').selectOption('green');
  await expect(page.getByTestId('panel-warnings')).toHaveCount(0);
});
