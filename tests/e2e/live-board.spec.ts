import { expect, test } from '@playwright/test';
import { DEMO, DEMO_COHORT, pageFor } from './foundation-helpers';

/**
 * Issue 13, the live board: the trainer assigns a drill to the demo cohort and opens its live
 * board; Ada starts her attempt and her tile turns to running; she presses the e-stop and the
 * board's timeline and tile show it; the trainer sends her a hint and it appears in her
 * attempt. Every wait is on the page's own state (tile text, timeline, the message list).
 */
const SHOTS = process.env.E2E_SHOTS_DIR;

test('the trainer watches a student on the live board and sends her a hint', async ({ browser }) => {
  test.setTimeout(120_000);
  const trainer = await pageFor(browser, DEMO.trainer);
  const { drills } = (await (await trainer.request.get('/api/drills')).json()) as { drills: { id: string; title: string }[] };
  const { cohorts } = (await (await trainer.request.get('/api/cohorts')).json()) as { cohorts: { id: string; name: string }[] };
  const cohort = cohorts.find((c) => c.name === DEMO_COHORT)!;
  const drill = drills[drills.length - 1];
  const now = Date.now();
  const made = await trainer.request.post(`/api/drills/${drill.id}/assignments`, {
    data: { cohortId: cohort.id, opensAt: new Date(now - 60_000).toISOString(), closesAt: new Date(now + 3_600_000).toISOString() },
    headers: { origin: new URL(trainer.url()).origin },
  });
  expect(made.status()).toBe(201);
  const { assignment } = (await made.json()) as { assignment: { id: string } };

  await trainer.goto(`/drills/assignments/${assignment.id}/live`);
  const board = trainer.getByTestId('live-board');
  await expect(board).toHaveAttribute('data-connection', 'open');
  const adaTile = board.getByTestId('live-tile').filter({ hasText: DEMO.student.name });
  await expect(adaTile.getByTestId('tile-status')).toHaveText('Not started');

  const student = await pageFor(browser, DEMO.student);
  await student.goto(`/drills/assignments/${assignment.id}`);
  await expect(student.getByTestId('saving-state')).toContainText('saved');
  await expect(adaTile.getByTestId('tile-status')).toHaveText('Running');

  await student.getByRole('group', { name: 'Run controls' }).getByRole('button', { name: 'Run' }).click();
  await student.getByTestId('panel-estop').click();
  await expect(trainer.getByTestId('live-timeline')).toContainText(`${DEMO.student.name}e-stop estop pressed`, { timeout: 15_000 });
  await expect(adaTile).toContainText('E-stop in: estop');

  const messages = trainer.getByRole('form', { name: 'Send a hint or message' });
  await messages.getByLabel('To').selectOption({ label: DEMO.student.name });
  await messages.getByLabel('Message').fill('Meter the stop circuit before you reset.');
  await messages.getByRole('button', { name: 'Send' }).click();
  await expect(trainer.getByTestId('live-messages')).toContainText('Meter the stop circuit before you reset.');
  await expect(student.getByTestId('run-messages')).toContainText('Meter the stop circuit before you reset.');
  if (SHOTS) await trainer.screenshot({ path: `${SHOTS}/live-board.png`, fullPage: true });

  // A click opens her run read-only, following it from the board's stream.
  await adaTile.click();
  await trainer.waitForURL(/\/runs\/[0-9a-f-]{36}\/replay$/);
  const follow = trainer.getByTestId('follow-live');
  await expect(follow).toContainText('Live');
  await expect(follow).toContainText('running');
  // Her batches keep arriving while she runs; the trainer catches the replay up with them.
  await expect(follow).toContainText('since this replay was loaded', { timeout: 20_000 });
  await student.getByRole('group', { name: 'Run controls' }).getByRole('button', { name: 'Pause' }).click();
  await follow.getByRole('button', { name: 'Catch up' }).click();
  await expect(trainer.getByTestId('replay')).toBeVisible({ timeout: 60_000 });
  if (SHOTS) {
    await trainer.screenshot({ path: `${SHOTS}/live-follow.png`, fullPage: true });
    await student.screenshot({ path: `${SHOTS}/live-student.png` });
  }
});
