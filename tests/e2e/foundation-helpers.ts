import { expect } from '@playwright/test';
import type { Browser, Page } from '@playwright/test';

/** Demo sign-ins (db/seeds/demo.ts; invented people). */
export const DEMO = {
  student: { email: 'ada.lindqvist@kestrelvale.test', password: 'student-demo-2026', name: 'Ada Lindqvist' },
  trainer: { email: 'trainer@kestrelvale.test', password: 'trainer-demo-2026', name: 'Tobias Okafor' },
  lead: { email: 'lead@brennick.test', password: 'lead-demo-2026', name: 'Greta Pallister' },
  admin: { email: 'admin@kestrelvale.test', password: 'admin-demo-2026', name: 'Ines Halvorsen' },
} as const;

export const DEMO_COHORT = 'RC-27A Robot cell integration';

/** Sign in through the form and land on the dashboard. */
export async function signInAs(page: Page, who: { email: string; password: string }): Promise<void> {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(who.email);
  await page.getByLabel('Password').fill(who.password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL('**/dashboard');
}

/** A fresh browser context per person, so sessions never mix. */
export async function pageFor(browser: Browser, who: { email: string; password: string }): Promise<Page> {
  const context = await browser.newContext();
  const page = await context.newPage();
  await signInAs(page, who);
  return page;
}

export function mainNav(page: Page) {
  return page.getByRole('navigation', { name: 'Main' });
}

export async function expectNav(page: Page, present: string[], absent: string[]): Promise<void> {
  const nav = mainNav(page);
  for (const label of present) await expect(nav.getByRole('link', { name: label, exact: true })).toBeVisible();
  for (const label of absent) await expect(nav.getByRole('link', { name: label, exact: true })).toHaveCount(0);
}
