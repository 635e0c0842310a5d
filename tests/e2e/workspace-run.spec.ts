import { readFile } from 'node:fs/promises';
import { expect, test } from '@playwright/test';
import { cellTimeMs, openArea, pressButton, settledCellTime, sharedDemoCellId, signIn, STUDENT, waitCellTime } from './workspace-helpers';

/*
 * The demo pick-and-place cell (simulator/demo/pick-and-place.ts) run live in the browser:
 * the handshake, the guard hold, the e-stop (ISO 13850: latching, and a reset does not
 * restart the machine), and forcing from the monitor.
 */
test('a student runs the demo cell: handshake, guard hold, e-stop, reset, restart, force', async ({ page }, testInfo) => {
  // Runs in cell time at ×1 (real time) through a whole handshake: longer than the default budget.
  test.setTimeout(120_000);
  await signIn(page, STUDENT);
  const id = await sharedDemoCellId(page);
  await page.goto(`/cells/${id}`);

  await expect(page.getByTestId('workspace')).toBeVisible();
  await expect(page.getByTestId('safety-caution')).toBeVisible();
  await expect(page.getByTestId('engine-status')).toHaveText('ready');

  await page.getByRole('button', { name: 'Run ×1', exact: true }).click();
  await expect(page.getByTestId('run-speed')).toHaveText('×1');
  // The demo controller boots in 1500 ms (controller.bootMs), then reports ready.
  await expect(page.getByTestId('controller-state')).toHaveText(/^ready/, { timeout: 10_000 });
  await page.screenshot({ path: testInfo.outputPath('panel.png'), fullPage: true });

  // A part at the pick station, then cycle start. Field checkboxes mirror the engine's state,
  // which answers a frame later, so the test clicks and then waits for the state.
  await openArea(page, 'Field');
  await page.getByTestId('field-part-sense').click();
  await expect(page.getByTestId('field-part-sense')).toBeChecked();
  await expect(page.getByTestId('field-part-led')).toHaveAttribute('data-on', 'true');
  await page.screenshot({ path: testInfo.outputPath('field.png'), fullPage: true });
  await openArea(page, 'Panel');
  await pressButton(page, 'start');

  await expect(page.getByTestId('controller-state')).toHaveText(/^cycling/, { timeout: 5_000 });
  // Green tier (tier 2 of the stack light) shows "cycling"; the arm moves.
  await expect(page.getByTestId('stack-stack-2')).toHaveAttribute('data-on', 'true');
  await expect(page.getByTestId('arm-state')).toHaveText(/^moving/);
  await page.screenshot({ path: testInfo.outputPath('panel-cycling.png'), fullPage: true });

  // Open the guard: the robot holds.
  await openArea(page, 'Field');
  await page.getByTestId('field-guard-sense').click();
  await expect(page.getByTestId('field-guard-sense')).not.toBeChecked();
  await expect(page.getByTestId('controller-state')).toHaveText(/holding.*held by guard/, { timeout: 5_000 });
  await expect(page.getByTestId('arm-state')).not.toHaveText(/^moving/, { timeout: 5_000 });
  // Close it again and start: the cycle goes on.
  await page.getByTestId('field-guard-sense').click();
  await expect(page.getByTestId('field-guard-sense')).toBeChecked();
  await openArea(page, 'Panel');
  await pressButton(page, 'start');
  await expect(page.getByTestId('controller-state')).toHaveText(/^cycling/, { timeout: 5_000 });

  // E-stop: the arm stops and the red tier lights.
  await page.getByTestId('panel-estop').click();
  await expect(page.getByTestId('panel-estop')).toHaveAttribute('aria-pressed', 'true');
  await expect(page.getByTestId('controller-state')).toHaveText(/^e stopped/, { timeout: 5_000 });
  await expect(page.getByTestId('arm-state')).not.toHaveText(/^moving/, { timeout: 5_000 });
  await expect(page.getByTestId('stack-stack-0')).toHaveAttribute('data-on', 'true');
  await page.screenshot({ path: testInfo.outputPath('panel-estop.png'), fullPage: true });

  // Release the e-stop and reset: the cell becomes ready but does not restart by itself.
  await page.getByTestId('panel-estop-release').click();
  await pressButton(page, 'reset');
  await expect(page.getByTestId('controller-state')).toHaveText(/^ready/, { timeout: 5_000 });
  await waitCellTime(page, 1_500);
  await expect(page.getByTestId('controller-state')).toHaveText(/^ready/);
  await expect(page.getByTestId('arm-state')).not.toHaveText(/^moving/);

  // Start again works.
  await pressButton(page, 'start');
  await expect(page.getByTestId('controller-state')).toHaveText(/^cycling/, { timeout: 5_000 });

  // Force the part sensor input from the monitor: the banner shows; unforce clears it.
  await openArea(page, 'Monitor');
  await expect(page.getByTestId('force-banner')).toHaveCount(0);
  await page.getByRole('button', { name: 'Force %IX0.5 to 0' }).click();
  await expect(page.getByTestId('force-banner')).toContainText('1 force active');
  await expect(page.getByTestId('monitor-%IX0.5')).toHaveAttribute('data-forced', 'true');
  await page.screenshot({ path: testInfo.outputPath('monitor.png'), fullPage: true });
  await page.getByRole('button', { name: 'Unforce %IX0.5' }).click();
  await expect(page.getByTestId('force-banner')).toHaveCount(0);
  await expect(page.getByTestId('monitor-%IX0.5')).toHaveAttribute('data-forced', 'false');

  // Forcing has its own caution; a point of the e-stop chain asks first (%IX0.2, wired to the e-stop).
  await expect(page.getByTestId('force-caution')).toContainText('bypasses the logic and its interlocks');
  await expect(page.getByTestId('monitor-%IX0.2-carries')).toHaveText('e-stop chain');
  await page.getByRole('button', { name: 'Force %IX0.2 to 1' }).click();
  const ask = page.getByRole('alertdialog');
  await expect(ask).toContainText('%IX0.2 carries the e-stop chain');
  await ask.getByRole('button', { name: 'Keep it unforced' }).click();
  await expect(ask).toHaveCount(0);
  await expect(page.getByTestId('monitor-%IX0.2')).toHaveAttribute('data-forced', 'false');
  await page.getByRole('button', { name: 'Force %IX0.2 to 1' }).click();
  await page.getByRole('alertdialog').getByRole('button', { name: 'Force %IX0.2 to 1' }).click();
  await expect(page.getByTestId('monitor-%IX0.2')).toHaveAttribute('data-forced', 'true');
  await page.getByRole('button', { name: 'Unforce %IX0.2' }).click();
  await expect(page.getByTestId('force-banner')).toHaveCount(0);

  // The run's event log (for replay and grading) starts with the part placed on the sensor.
  const download = page.waitForEvent('download');
  await page.getByRole('button', { name: /^Event log/ }).click();
  const log = JSON.parse(await readFile((await (await download).path())!, 'utf8')) as { t: number; event: unknown }[];
  expect(log[0].event).toEqual({ type: 'set-field', device: 'part', active: true });
  expect(log.some((e) => JSON.stringify(e.event) === JSON.stringify({ type: 'press', device: 'estop' }))).toBe(true);

  await openArea(page, 'Scope');
  await expect(page.getByTestId('scope-plot')).toBeVisible();
  await expect(page.getByTestId('scope-lane-%IX0.0')).toBeVisible();
  // Two cursors: click twice on the plot; the readout gives the time between them.
  const plot = page.getByTestId('scope-plot');
  const box = (await plot.boundingBox())!;
  await page.getByRole('checkbox', { name: 'Hold display' }).check();
  await plot.click({ position: { x: box.width * 0.3, y: box.height / 2 } });
  await plot.click({ position: { x: box.width * 0.7, y: box.height / 2 } });
  await expect(page.getByTestId('scope-delta')).toHaveText(/^\d+ ms$/);
  await page.screenshot({ path: testInfo.outputPath('scope.png'), fullPage: true });
  await openArea(page, 'Logic');
  await expect(page.getByText('Loading the logic sheet…')).toHaveCount(0, { timeout: 30_000 });
  await page.screenshot({ path: testInfo.outputPath('logic.png'), fullPage: true });
  await openArea(page, 'Controller');
  await expect(page.getByText('Loading the controller…')).toHaveCount(0, { timeout: 30_000 });
  await page.screenshot({ path: testInfo.outputPath('controller.png'), fullPage: true });
});

test('run controls: pause holds the clock, one scan steps it by the scan period', async ({ page }) => {
  await signIn(page, STUDENT);
  const id = await sharedDemoCellId(page);
  await page.goto(`/cells/${id}`);
  await expect(page.getByTestId('engine-status')).toHaveText('ready');
  await page.getByRole('button', { name: 'Run ×10', exact: true }).click();
  await expect.poll(() => cellTimeMs(page)).toBeGreaterThan(0);
  await page.getByRole('button', { name: 'Pause' }).click();
  await expect(page.getByTestId('run-speed')).toHaveText('paused');
  // The frame already on its way when Pause was pressed may still arrive: wait until the time settles.
  const held = await settledCellTime(page);
  // It stays held over several more reads.
  let reads = 0;
  await expect
    .poll(
      async () => {
        expect(await page.getByTestId('cell-time').textContent()).toBe(held);
        return ++reads;
      },
      { intervals: [250] },
    )
    .toBeGreaterThanOrEqual(3);
  await page.getByRole('button', { name: 'Step one scan' }).click();
  await expect(page.getByTestId('cell-time')).not.toHaveText(held!);
  const toMs = (t: string) => {
    const [m, s] = t.split(':');
    return Math.round((Number(m) * 60 + Number(s)) * 1000);
  };
  const after = toMs((await page.getByTestId('cell-time').textContent())!);
  // Demo scan period 10 ms (simulator/demo/pick-and-place.ts): a step ends on the next multiple of 10 ms.
  expect(after % 10).toBe(0);
  expect(after - toMs(held!)).toBeGreaterThan(0);
  expect(after - toMs(held!)).toBeLessThanOrEqual(10);
});
