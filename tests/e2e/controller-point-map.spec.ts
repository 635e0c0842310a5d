import { expect, test } from '@playwright/test';
import { STUDENT, newPickAndPlaceCell, openArea, signIn, waitCellTime } from './workspace-helpers';

/**
 * Point-map edits are staged and take effect only after a controller restart (DESIGN.md).
 * The demo cell maps DO1..DO7 (ready, at home, …) to rack 1 slot 3 from channel 0; the PLC
 * reads "robot ready" from channel 0 of that module. Moving the range to first channel 8 on its
 * slot card must leave the run on channel 0 until the reboot, and put "ready" on channel 8 after it.
 */
test('a point-map edit stays staged until the controller reboots', async ({ page }) => {
  await signIn(page, STUDENT);
  const id = await newPickAndPlaceCell(page, `Point-map e2e ${Date.now()}`);
  try {
    await page.goto(`/cells/${id}`);
    await page.getByRole('button', { name: 'Run ×1', exact: true }).click();
    await openArea(page, 'Controller');

    const state = page.getByTestId('controller-status').getByTestId('controller-state');
    // The demo controller boots in 1.5 s of cell time and then reports ready.
    await expect(state).toHaveAttribute('data-state', 'ready', { timeout: 20_000 });
    const ch0 = page.getByTestId('channel-1-3-0');
    const ch8 = page.getByTestId('channel-1-3-8');
    await expect(ch0).toHaveAttribute('data-on', 'true');
    await expect(ch8).toHaveAttribute('data-on', 'false');

    // The range is edited on the card of the slot it maps to.
    const row = page.getByTestId('slot-1-3').getByTestId('point-map-row-pm-do');
    await expect(row).toHaveAttribute('data-state', 'in-force');
    await expect(page.getByTestId('point-map-state-pm-do')).toHaveText('in force');
    const first = row.getByLabel('First channel of pm-do');
    await first.fill('8');
    await first.press('Enter');

    await expect(row).toHaveAttribute('data-state', 'waiting');
    await expect(page.getByTestId('point-map-state-pm-do')).toHaveText('waits for reboot · changed');
    await expect(page.getByTestId('point-map-why-pm-do')).toContainText('first channel 0 → 8');
    // Nothing changes in the run: give it a second of cell time and look again.
    await waitCellTime(page, 1000);
    await expect(state).toHaveAttribute('data-state', 'ready');
    await expect(ch0).toHaveAttribute('data-on', 'true');
    await expect(ch8).toHaveAttribute('data-on', 'false');

    await page.getByRole('button', { name: 'Reboot controller, staged ranges in force' }).click();
    await expect(row).toHaveAttribute('data-state', 'in-force');
    await expect(state).toHaveAttribute('data-state', 'ready', { timeout: 20_000 });
    await expect(ch8).toHaveAttribute('data-on', 'true');
    await expect(ch0).toHaveAttribute('data-on', 'false');
    await expect(page.getByTestId('point-map-summary')).toContainText('Nothing staged');

    // Moving the outputs onto the input module clashes: the range says why and the reboot waits.
    await row.getByLabel('Slot of pm-do').selectOption('1.2');
    const moved = page.getByTestId('slot-1-2').getByTestId('point-map-row-pm-do');
    await expect(moved).toHaveAttribute('data-state', 'clash');
    await expect(page.getByTestId('point-map-why-pm-do')).toContainText('digital out points need a digital-out module');
    await expect(page.getByRole('button', { name: 'Reboot controller, staged ranges in force' })).toBeDisabled();
    await page.getByRole('button', { name: 'Drop staged changes' }).click();
    await expect(row).toHaveAttribute('data-state', 'in-force');
  } finally {
    await page.request.delete(`/api/cells/${id}`);
  }
});
