import { expect, test } from '@playwright/test';
import { DEMO, DEMO_COHORT, pageFor } from './foundation-helpers';

/**
 * Issue 5 end to end: a trainer writes a drill with a hidden broken wire in the NC stop circuit
 * and assigns it; the student finds the e-mail (read by the admin in the Mailbox, as the
 * foundation's tests do), runs the drill on the server, sees the symptom, submits the
 * diagnosis; the trainer sees the grade in the gradebook and replays the run.
 */
test('a trainer assigns a drill; the student runs it, finds the fault and submits; the trainer grades and replays it', async ({ browser }) => {
  test.setTimeout(180_000);
  const title = `Stop circuit drill ${Date.now().toString(36)}`;

  // Trainer: a new drill on the demo pick-and-place cell with one hidden fault card.
  const trainer = await pageFor(browser, DEMO.trainer);
  await trainer.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Drills' }).click();
  await trainer.getByTestId('new-drill').click();
  await trainer.getByLabel('Title').fill(title);
  const base = await trainer.getByLabel('Base cell').locator('option', { hasText: 'Kestrel Vale Cell B' }).first().getAttribute('value');
  await trainer.getByLabel('Base cell').selectOption(base!);
  const fault = trainer.getByTestId('fault-0');
  await fault.getByLabel('Kind').selectOption('open-wire');
  await fault.getByLabel('Wire (row)').selectOption('w-stop');
  await fault.getByLabel('Appears').selectOption('now');
  await trainer.getByLabel('Fault kind (the answer)').selectOption('open-wire');
  await trainer.getByLabel('Where (the answer)').selectOption('w-stop');
  await trainer.getByTestId('save-drill').click();
  await trainer.waitForURL(/\/drills\/[0-9a-f-]{36}$/);
  await expect(trainer.getByRole('heading', { level: 1 })).toHaveText(title);

  const cohortValue = await trainer.getByLabel('Cohort', { exact: true }).locator('option', { hasText: DEMO_COHORT }).getAttribute('value');
  await trainer.getByLabel('Cohort', { exact: true }).selectOption(cohortValue!);
  await trainer.getByTestId('assign-drill').click();
  await expect(trainer.getByRole('status').filter({ hasText: 'Assigned.' })).toContainText('students were e-mailed');
  await expect(trainer.getByTestId('drill-assignments')).toContainText(DEMO_COHORT);

  // Admin: the e-mail to the student is in the Mailbox; its link opens the attempt.
  const admin = await pageFor(browser, DEMO.admin);
  await admin.getByRole('link', { name: 'Mailbox' }).click();
  await admin.getByRole('button').filter({ hasText: `New drill: ${title}` }).filter({ hasText: DEMO.student.email }).click();
  const message = admin.getByRole('article', { name: 'Message' });
  await expect(message.getByRole('heading')).toHaveText(`New drill: ${title}`);
  const link = await message.getByTestId('mail-text').getByRole('link').getAttribute('href');
  expect(link).toMatch(/\/drills\/assignments\/[0-9a-f-]{36}$/);
  await admin.context().close();

  // Student: the drill is on the dashboard; the link opens the attempt (the cell runs on the server).
  const student = await pageFor(browser, DEMO.student);
  await expect(student.getByRole('region', { name: 'My drills' })).toContainText(title);
  const firstView = student.waitForResponse((r) => r.url().includes('/view?t=') && r.ok());
  await student.goto(link!);
  await expect(student.getByRole('heading', { level: 1 })).toHaveText(title);
  // What the browser receives never names a fault card (the payload, not only the screen).
  const viewBody = await (await firstView).json();
  expect(JSON.stringify(viewBody)).not.toContain('"faults"');
  expect(JSON.stringify(viewBody)).not.toContain('open-wire');
  await expect(student.getByTestId('saving-state')).toContainText('saved');

  await student.getByRole('group', { name: 'Run controls' }).getByRole('button', { name: 'Run' }).click();
  await expect(student.getByTestId('cell-time')).not.toHaveText('0:00.000');
  // Let at least one second of cell time pass, so the replay below has room to scrub to 0.5 s.
  await expect(student.getByTestId('cell-time')).toHaveText(/^\d+:(0[1-9]|[1-5]\d)\./, { timeout: 15_000 });
  // The symptom: the NC stop circuit reads OFF although nobody presses stop (common practice: a broken NC wire reads as "stop").
  await student.getByRole('tab', { name: /Field/ }).click();
  await expect(student.getByTestId('wire-w-stop')).toHaveAttribute('data-reading', 'off');
  await student.getByRole('group', { name: 'Run controls' }).getByRole('button', { name: 'Pause' }).click();

  await student.getByTestId('open-submit').click();
  const dialog = student.getByTestId('submit-dialog');
  await dialog.getByLabel('Fault kind').selectOption('open-wire');
  await dialog.getByLabel('Where').selectOption('w-stop');
  await dialog.getByLabel('Note for your trainer (optional)').fill('Stop input reads off with the button released: open conductor on w-stop.');
  await dialog.getByTestId('confirm-submit').click();
  await student.waitForURL(/\/runs\/[0-9a-f-]{36}$/);
  // The drill has no rules and a diagnosis weight of 10: the right kind at the right place earns
  // all of it (grading as lib/runs/grade.ts defines it), so the server's grade is 100 %.
  await expect(student.getByTestId('run-grade')).toHaveText('100%');
  await expect(student.getByTestId('run-diagnosis-note')).toHaveText('Stop input reads off with the button released: open conductor on w-stop.');
  const runUrl = student.url();
  await student.context().close();

  // Trainer: the grade is in the gradebook; the run replays.
  await trainer.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Gradebook' }).click();
  const book = trainer.getByTestId('gradebook');
  await expect(book).toContainText(title.toUpperCase(), { ignoreCase: true });
  const row = book.getByRole('row').filter({ hasText: DEMO.student.name });
  await row.getByRole('button', { name: new RegExp(DEMO.student.name) }).click();
  const detail = trainer.getByTestId('student-detail');
  // The student's row also holds the demo's earlier drill: check this drill's own line.
  const line = detail.getByRole('row').filter({ hasText: title });
  await expect(line).toContainText('100%');
  await line.getByTestId('replay-link').click();
  await trainer.waitForURL(`${runUrl}/replay`);
  await expect(trainer.getByTestId('replay')).toBeVisible();
  await expect(trainer.getByTestId('replay-time')).toContainText('0:00.000 /');
  await trainer.getByTestId('replay-step').click();
  await expect(trainer.getByTestId('replay-time')).toContainText('0:00.010 /');
  await trainer.getByTestId('replay-scrub').fill('500');
  await expect(trainer.getByTestId('replay-time')).toContainText('0:00.500 /');
  await trainer.context().close();
});
