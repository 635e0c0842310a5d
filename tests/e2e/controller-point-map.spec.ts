import { expect, test } from '@playwright/test';
import { STUDENT, newPickAndPlaceCell, openArea, signIn, waitCellTime } from './workspace-helpers';

/**
 * Point-map edits are staged and take effect only after a controller restart (DESIGN.md).
 * The demo cell maps DO1..DO7 (ready, at home, …) to rack 0 slot 2 from channel 0; the PLC
 * reads "robot ready" from channel 0 of that module. Moving the row to first channel 8 must
 * leave the run on channel 0 until the restart, and put "ready" on channel 8 after it.
 */
test('a point-map edit stays staged until the controller restarts', async ({ page }) => {
  await signIn(page, STUDENT);
  const id = await newPickAndPlaceCell(page, `Point-map e2e ${Date.now()}`);
  try {
    await page.goto(`/cells/${id}`);
    await page.getByRole('button', { name: 'Run ×1', exact: true }).click();
    await openArea(page, 'Controller');

    const state = page.getByTestId('controller-status').getByTestId('controller-state');
    // The demo controller boots in 1.5 s of cell time and then reports ready.
    await expect(state).toHaveAttribute('data-state', 'ready', { timeout: 20_000 });
    const ch0 = page.getByTestId('channel-0-2-0');
    const ch8 = page.getByTestId('channel-0-2-8');
    await expect(ch0).toHaveAttribute('data-on', 'true');
    await expect(ch8).toHaveAttribute('data-on', 'false');

    const row = page.getByTestId('point-map-row-pm-do');
    await expect(row).toHaveAttribute('data-state', 'live');
    const first = page.getByLabel('First channel of pm-do');
    await first.fill('8');
    await first.press('Enter');

    await expect(row).toHaveAttribute('data-state', 'staged');
    await expect(page.getByTestId('point-map-why-pm-do')).toContainText('first channel 0 → 8');
    // Nothing changes in the run: give it a second of cell time and look again.
    await waitCellTime(page, 1000);
    await expect(state).toHaveAttribute('data-state', 'ready');
    await expect(ch0).toHaveAttribute('data-on', 'true');
    await expect(ch8).toHaveAttribute('data-on', 'false');

    await page.getByTestId('restart-controller').click();
    await expect(row).toHaveAttribute('data-state', 'live');
    await expect(state).toHaveAttribute('data-state', 'ready', { timeout: 20_000 });
    await expect(ch8).toHaveAttribute('data-on', 'true');
    await expect(ch0).toHaveAttribute('data-on', 'false');
    await expect(page.getByTestId('point-map-summary')).toContainText('No staged changes');
  } finally {
    await page.request.delete(`/api/cells/${id}`);
  }
});
