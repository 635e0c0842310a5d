import { expect, test } from '@playwright/test';
import { DEMO, expectNav, signInAs } from './foundation-helpers';

test.describe('each demo role sees its own navigation', () => {
  test('student', async ({ page }) => {
    await signInAs(page, DEMO.student);
    await expect(page.getByTestId('signed-in-as')).toHaveText(DEMO.student.name);
    await expect(page.getByTestId('role-badge')).toHaveText('Student');
    await expectNav(page, ['Dashboard'], ['Cohorts', 'Users', 'Mailbox']);
    await expect(page.getByRole('region', { name: 'Your cohorts' })).toContainText('RC-27A Robot cell integration');
  });

  test('trainer', async ({ page }) => {
    await signInAs(page, DEMO.trainer);
    await expect(page.getByTestId('role-badge')).toHaveText('Trainer');
    await expectNav(page, ['Dashboard', 'Cohorts'], ['Users', 'Mailbox']);
    await expect(page.getByRole('region', { name: 'Your cohorts' })).toContainText('RC-27A Robot cell integration');
  });

  test('maintenance lead', async ({ page }) => {
    await signInAs(page, DEMO.lead);
    await expect(page.getByTestId('role-badge')).toHaveText('Maintenance lead');
    await expectNav(page, ['Dashboard'], ['Cohorts', 'Users', 'Mailbox']);
    await expect(page.getByRole('region', { name: 'Your plant' })).toContainText('Brennick Fasteners');
    await expect(page.getByTestId('safety-caution')).toBeVisible();
  });

  test('admin', async ({ page }) => {
    await signInAs(page, DEMO.admin);
    await expect(page.getByTestId('role-badge')).toHaveText('Administrator');
    await expectNav(page, ['Dashboard', 'Cohorts', 'Users', 'Mailbox'], []);
    await page.getByRole('link', { name: 'Users', exact: true }).click();
    await expect(page.getByRole('table', { name: 'Users' })).toContainText('ada.lindqvist@kestrelvale.test');
  });
});

test('a student opening trainer and admin pages is refused', async ({ page }) => {
  await signInAs(page, DEMO.student);
  for (const path of ['/cohorts', '/admin/users', '/admin/mailbox']) {
    await page.goto(path);
    await expect(page.getByTestId('access-refused')).toBeVisible();
    await expect(page.getByRole('heading', { name: 'Not available to your role' })).toBeVisible();
  }
  const api = await page.request.get('/api/cohorts');
  expect(api.status()).toBe(403);
});

test('anonymous visitors are sent to sign-in', async ({ page }) => {
  await page.goto('/cohorts');
  await expect(page).toHaveURL(/\/sign-in\?callbackUrl=%2Fcohorts/);
  const api = await page.request.get('/api/cohorts');
  expect(api.status()).toBe(401);
});

test('a wrong password gets the generic message', async ({ page }) => {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(DEMO.trainer.email);
  await page.getByLabel('Password').fill('not-the-password');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByRole('form', { name: 'Sign in' }).getByRole('alert')).toHaveText('The e-mail address or password is not right.');
  await expect(page).toHaveURL(/\/sign-in/);
});

test('sign-out ends the session', async ({ page }) => {
  await signInAs(page, DEMO.trainer);
  await page.getByRole('button', { name: 'Sign out' }).click();
  await page.waitForURL((url) => url.pathname === '/');
  await page.goto('/dashboard');
  await expect(page).toHaveURL(/\/sign-in/);
});

test('unknown addresses show the 404 page', async ({ page }) => {
  const res = await page.goto('/no-such-page');
  expect(res?.status()).toBe(404);
  await expect(page.getByRole('heading', { name: 'Nothing at this address' })).toBeVisible();
});
