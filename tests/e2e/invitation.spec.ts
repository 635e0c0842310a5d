import { expect, test } from '@playwright/test';
import { DEMO, DEMO_COHORT, expectNav, pageFor, signInAs } from './foundation-helpers';

test('a trainer invites an address; the mail arrives in the Mailbox; the link sets a password; the student signs in', async ({ browser }) => {
  const email = `new.student.${Date.now().toString(36)}@example.test`;

  // Trainer invites the new address (and a bad one, which is reported, not sent).
  const trainer = await pageFor(browser, DEMO.trainer);
  await trainer.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Cohorts' }).click();
  await trainer.getByRole('link', { name: DEMO_COHORT }).click();
  await trainer.getByLabel('E-mail addresses').fill(`${email}, not-an-address`);
  await trainer.getByRole('button', { name: 'Send invitations' }).click();
  const results = trainer.getByRole('list', { name: 'Invitation results' });
  await expect(results.getByTestId('invite-result').filter({ hasText: email })).toContainText('invitation sent');
  await expect(results.getByTestId('invite-result').filter({ hasText: 'not-an-address' })).toContainText('Not a valid e-mail address.');
  await expect(trainer.getByRole('table', { name: 'Open invitations' })).toContainText(email);
  await trainer.context().close();

  // The admin finds it in the Mailbox and takes the link.
  const admin = await pageFor(browser, DEMO.admin);
  await admin.getByRole('link', { name: 'Mailbox' }).click();
  await admin.getByRole('button', { name: new RegExp(`to ${email.replace(/\./g, '\\.')}`) }).click();
  const message = admin.getByRole('article', { name: 'Message' });
  await expect(message.getByRole('heading')).toHaveText(`Invitation to ${DEMO_COHORT} on Cellwright`);
  const link = await message.getByTestId('mail-text').getByRole('link').getAttribute('href');
  expect(link).toMatch(/\/invite\/[A-Za-z0-9_-]+$/);
  await admin.context().close();

  // The invitee sets name and password with the link.
  const context = await browser.newContext();
  const invitee = await context.newPage();
  await invitee.goto(link!);
  await expect(invitee.getByRole('heading', { name: 'Create your account' })).toBeVisible();
  await invitee.getByLabel('Your name').fill('Juno Castellanos');
  await invitee.getByLabel('Password', { exact: true }).fill('juno-first-password');
  await invitee.getByLabel('Repeat the password').fill('juno-first-password');
  await invitee.getByRole('button', { name: 'Create account and join' }).click();
  await invitee.waitForURL('**/sign-in?notice=account-created');
  await expect(invitee.getByRole('status')).toContainText('Your account is ready');

  // ... and signs in as a student of the cohort.
  await signInAs(invitee, { email, password: 'juno-first-password' });
  await expect(invitee.getByTestId('role-badge')).toHaveText('Student');
  await expectNav(invitee, ['Dashboard'], ['Cohorts', 'Users', 'Mailbox']);
  await expect(invitee.getByRole('region', { name: 'Your cohorts' })).toContainText(DEMO_COHORT);

  // The link was single-use.
  await invitee.goto(link!);
  await expect(invitee.getByTestId('link-problem')).toContainText('already used');
  await context.close();
});
