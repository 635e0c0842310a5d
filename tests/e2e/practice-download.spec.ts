import { expect, test } from '@playwright/test';
import { cellTimeMs, openArea, sharedDemoCellId, signIn, STUDENT } from './workspace-helpers';

/*
 * Free practice on the demo pick-and-place cell (simulator/demo/pick-and-place.ts): the student
 * edits a logic block's parameter while the cell runs, sends it with "Send to cell", and the
 * run goes on (docs/engine.md "Downloading edits": the clock does not restart). The download is
 * part of the saved run's event log, so its replay runs it too.
 */


test('a student downloads a logic edit into a running practice cell; the run goes on and is saved with the download', async ({ page }) => {
  test.setTimeout(90_000);
  await signIn(page, STUDENT);
  const cellId = await sharedDemoCellId(page);
  await page.goto(`/runs/practice/${cellId}`);

  await expect(page.getByTestId('workspace')).toBeVisible();
  await expect(page.getByTestId('engine-status')).toHaveText('ready');
  const replayHref = await page.getByTestId('practice-recording').getByRole('link', { name: 'replay it' }).getAttribute('href');
  const runId = /^\/runs\/([^/]+)\/replay$/.exec(replayHref ?? '')?.[1];
  expect(runId, 'the practice page links the run it records').toBeTruthy();

  await page.getByRole('button', { name: 'Run ×1', exact: true }).click();
  await expect(page.getByTestId('run-speed')).toHaveText('×1');
  await expect.poll(() => cellTimeMs(page), { timeout: 10_000 }).toBeGreaterThan(1_000);

  // The Logic area is editable in practice and carries the download bar.
  await openArea(page, 'Logic');
  await expect(page.getByText('Loading the logic sheet…')).toHaveCount(0, { timeout: 30_000 });
  const bar = page.getByTestId('download-bar');
  await expect(bar).toBeVisible();
  await expect(page.getByTestId('download-status')).toHaveText('The running cell has your edits.');
  await expect(bar.getByRole('button', { name: 'Send to cell' })).toBeDisabled();

  // The start pulse is a TP block with PT 100 ms in the demo cell.
  const block = page.getByTestId('block-startPulse');
  await expect(block).toContainText('PT 100 ms');
  // Its neighbour (the robotStart coil) overlaps its right side on the canvas: click its header's left end.
  await block.click({ position: { x: 6, y: 6 } });
  const inspector = page.getByTestId('block-inspector');
  await expect(inspector).toContainText('startPulse');
  const pt = inspector.getByLabel('PT (ms)');
  await pt.fill('250');
  await pt.press('Enter');
  await expect(block).toContainText('PT 250 ms');

  // The edit waits for the download: the status says so, and the run did not start over.
  await expect(page.getByTestId('download-status')).toContainText('Edited, not yet in the running cell: logic sheet');
  const beforeDownload = await cellTimeMs(page);
  expect(beforeDownload).toBeGreaterThan(1_000);
  await expect.poll(() => cellTimeMs(page)).toBeGreaterThan(beforeDownload);

  await bar.getByRole('button', { name: 'Send to cell' }).click();
  await expect(page.getByTestId('download-status')).toHaveText('The running cell has your edits.');
  await expect(page.getByTestId('download-refused')).toHaveCount(0);
  await expect(page.getByTestId('event-refused')).toHaveCount(0);
  await expect(block).toContainText('PT 250 ms');
  // Cell time keeps counting from where it was (a reload would have started again at 0).
  await expect.poll(() => cellTimeMs(page)).toBeGreaterThan(beforeDownload);
  await expect(page.getByTestId('engine-status')).toHaveText('ready');
  // Still the first run of the session: nothing restarted the cell.
  await expect(page.getByTestId('practice-recording')).not.toContainText('the cell restarted');

  // The stored log holds the download with the new preset, at a cell time after the edit began.
  await expect
    .poll(
      async () => {
        const res = await page.request.get(`/api/runs/${runId}/events?pageSize=200`);
        if (!res.ok()) return null;
        const body = (await res.json()) as { events: { t: number; event: { type: string; logic?: { blocks: { id: string; params?: { PT?: number } }[] } } }[] };
        const d = body.events.find((e) => e.event.type === 'download');
        return d ? { t: d.t, pt: d.event.logic?.blocks.find((b) => b.id === 'startPulse')?.params?.PT } : null;
      },
      { timeout: 15_000 },
    )
    .toMatchObject({ pt: 250 });
  const events = (await (await page.request.get(`/api/runs/${runId}/events?pageSize=200`)).json()) as { events: { t: number; event: { type: string } }[] };
  const download = events.events.find((e) => e.event.type === 'download')!;
  expect(download.t).toBeGreaterThanOrEqual(beforeDownload);

  // The run is listed on /runs with its replay.
  await page.goto('/runs');
  const row = page.getByTestId('runs-table').getByRole('row').filter({ has: page.locator(`a[href="/runs/${runId}"]`) });
  await expect(row).toHaveCount(1);
  await expect(row).toContainText('Free practice');
  const replay = row.getByRole('link', { name: 'Replay' });
  await expect(replay).toHaveAttribute('href', `/runs/${runId}/replay`);
  await replay.click();
  await page.waitForURL(`**/runs/${runId}/replay`);
  await expect(page.getByTestId('replay')).toBeVisible();
  await expect(page.getByTestId('replay-time')).toContainText('0:00.000 /');
});
