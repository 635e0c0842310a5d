import { expect, test } from '@playwright/test';
import { DEMO, pageFor } from './foundation-helpers';

/**
 * The regrade check in the browser: the trainer queues it on last week's demo drill (two
 * graded attempts), the job worker that Playwright starts runs it, and the page follows it
 * over the live stream to the report — without reloading.
 */
test('a trainer regrades every submitted run of a drill and watches it finish live', async ({ browser }) => {
  test.setTimeout(90_000);
  const trainer = await pageFor(browser, DEMO.trainer);
  await trainer.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Drills' }).click();
  await trainer.getByRole('link', { name: 'Start resets, reset starts' }).first().click();
  await trainer.waitForURL(/\/drills\/[0-9a-f-]{36}$/);

  const card = trainer.getByRole('region', { name: 'Regrade check' });
  await card.getByRole('button', { name: 'Regrade every submitted run of this drill' }).click();
  const progress = card.getByRole('progressbar', { name: 'Regrade check' });
  await expect(progress).toBeVisible();
  await expect(card.getByTestId('job-state')).toHaveText('Finished', { timeout: 60_000 });
  await expect(progress).toHaveAttribute('aria-valuenow', '2');
  await expect(progress).toHaveAttribute('aria-valuemax', '2');
  await expect(card.getByRole('status').filter({ hasText: 'submitted runs re-simulated' })).toContainText('All 2 submitted runs re-simulated to the grade and trace stored at submission.');
  // The button is back for the next check.
  await expect(card.getByRole('button', { name: 'Regrade every submitted run of this drill' })).toBeEnabled();
});
