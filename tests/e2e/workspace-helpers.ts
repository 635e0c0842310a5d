import { expect, type Page } from '@playwright/test';

/** Demo sign-ins from db/seeds/demo.ts (invented people). */
export const STUDENT = { email: 'ada.lindqvist@kestrelvale.test', password: 'student-demo-2026' };
export const DEMO_CELL_NAME = 'Kestrel Vale Cell B — pick and place';

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

/** Presses a momentary panel button with the keyboard and holds it for `holdMs` of cell time (several PLC scans). */
export async function pressButton(page: Page, deviceId: string, holdMs = 250) {
  const button = page.getByTestId(`panel-${deviceId}`);
  await button.focus();
  await page.keyboard.down('Space');
  await expect(button).toHaveAttribute('aria-pressed', 'true');
  await waitCellTime(page, holdMs);
  await page.keyboard.up('Space');
  await expect(button).toHaveAttribute('aria-pressed', 'false');
}

/** Cell time shown in the run strip (`m:ss.mmm`) in ms. */
export async function cellTimeMs(page: Page): Promise<number> {
  const text = (await page.getByTestId('cell-time').textContent()) ?? '';
  const [m, s] = text.trim().split(':');
  return Math.round((Number(m) * 60 + Number(s)) * 1000);
}

/** Waits until the running cell has advanced `ms` of cell time past where it is now. */
export async function waitCellTime(page: Page, ms: number): Promise<void> {
  const from = await cellTimeMs(page);
  await expect.poll(() => cellTimeMs(page), { timeout: 15_000 }).toBeGreaterThanOrEqual(from + ms);
}

/** Waits until the shown cell time stops changing (a paused cell's last frame has arrived); returns it. */
export async function settledCellTime(page: Page): Promise<string> {
  let last = '';
  await expect
    .poll(
      async () => {
        const now = (await page.getByTestId('cell-time').textContent()) ?? '';
        const same = now === last;
        last = now;
        return same;
      },
      { intervals: [250], timeout: 10_000 },
    )
    .toBe(true);
  return last;
}
