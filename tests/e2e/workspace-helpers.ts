import { expect, type Page } from '@playwright/test';

/** Demo sign-ins from db/seeds/demo.ts (invented people). */
export const STUDENT = { email: 'ada.lindqvist@kestrelvale.test', password: 'student-demo-2026' };
export const DEMO_CELL_NAME = 'Harbourside Cell B — pick and place';

export async function signIn(page: Page, who: { email: string; password: string }) {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(who.email);
  await page.getByLabel('Password').fill(who.password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
}

/** The id of the demo pick-and-place cell shared with the signed-in student's cohort. */
export async function sharedDemoCellId(page: Page): Promise<string> {
  const res = await page.request.get('/api/cells');
  expect(res.ok()).toBe(true);
  const body = (await res.json()) as { shared: { id: string; name: string }[] };
  const demo = body.shared.find((c) => c.name === DEMO_CELL_NAME);
  expect(demo, 'the demo cell is shared with the demo cohort').toBeTruthy();
  return demo!.id;
}

/** A fresh cell of the signed-in user, from the pick-and-place template. */
export async function newPickAndPlaceCell(page: Page, name: string): Promise<string> {
  const res = await page.request.post('/api/cells', { data: { name, template: 'pick-and-place' } });
  expect(res.status()).toBe(201);
  return ((await res.json()) as { cell: { id: string } }).cell.id;
}

/** Opens a workspace area by its tab. */
export async function openArea(page: Page, name: 'Panel' | 'Field' | 'Logic' | 'Controller' | 'Monitor' | 'Scope') {
  await page.getByRole('tab', { name }).click();
  await expect(page.getByRole('tab', { name })).toHaveAttribute('aria-selected', 'true');
}

/** Presses a momentary panel button with the keyboard and holds it long enough for several PLC scans. */
export async function pressButton(page: Page, deviceId: string, holdMs = 250) {
  const button = page.getByTestId(`panel-${deviceId}`);
  await button.focus();
  await page.keyboard.down('Space');
  await expect(button).toHaveAttribute('aria-pressed', 'true');
  await page.waitForTimeout(holdMs);
  await page.keyboard.up('Space');
  await expect(button).toHaveAttribute('aria-pressed', 'false');
}
