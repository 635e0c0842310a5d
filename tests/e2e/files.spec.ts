/**
 * Files kept in the bucket, downloaded through the app (issue #13): a student exports the
 * archive of their own drill run from its result page and gets the run, its cell and its log.
 * (The printed changeover report is downloaded in changeover.spec.ts, right after sign-off.)
 */
import { readFile } from 'node:fs/promises';
import { expect, test } from '@playwright/test';
import { DEMO, pageFor } from './foundation-helpers';

test('a student downloads the archive of their own drill run, without the drill’s seed', async ({ browser }) => {
  const page = await pageFor(browser, DEMO.student);
  await page.goto('/runs');
  // Her graded attempt at last week's closed drill (seeded with its event log); other specs may
  // have started attempts of hers that have no events yet.
  await page.getByTestId('drill-runs-table').getByRole('row').filter({ hasText: 'Start resets, reset starts' }).getByRole('link').first().click();
  await page.waitForURL(/\/runs\/[0-9a-f-]{36}$/);
  const runId = page.url().split('/').pop()!;
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('download-run-archive').click()]);
  expect(download.suggestedFilename()).toMatch(/^run-[0-9a-f]{8}-[0-9a-f]{12}\.json$/);
  const file = JSON.parse(await readFile((await download.path())!, 'utf8'));
  expect(file).toMatchObject({ format: 'cellwright-run-archive', version: 1, run: { id: runId, userName: DEMO.student.name } });
  expect(file.run).not.toHaveProperty('seed');
  expect(file.cell).toMatchObject({ version: expect.any(Number), document: { schemaVersion: expect.any(Number), panel: expect.any(Array) } });
  expect(file.log.events.length).toBeGreaterThan(0);
  await expect(page.getByTestId('download-run-archive')).toBeEnabled();
  await page.context().close();
});
