import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Locator, type Page } from '@playwright/test';
import { DEMO, DEMO_COHORT, mainNav, signInAs } from './foundation-helpers';
import { DEMO_CELL_NAME } from './workspace-helpers';

/*
 * Issue 12, "usable anywhere": at 800 px (a tablet, or a laptop window beside the drill brief) the
 * sidebar folds to a rail, and the user menu and each page's main actions stay inside the
 * viewport with no sideways scroll of the page; the sidebar's toggle works from the keyboard.
 * And the app's icon answers at /favicon.ico.
 */

const NARROW = { width: 800, height: 900 };
const WIDE = { width: 1440, height: 900 };
const NARROWEST = { width: 768, height: 900 };

/** The element is rendered and lies wholly inside the viewport's width. */
async function expectInside(page: Page, locator: Locator, what: string): Promise<void> {
  await expect(locator, what).toBeVisible();
  const box = await locator.boundingBox();
  const width = page.viewportSize()!.width;
  expect(box, what).not.toBeNull();
  expect(box!.x, `${what}: left edge`).toBeGreaterThanOrEqual(0);
  expect(box!.x + box!.width, `${what}: right edge within ${width} px`).toBeLessThanOrEqual(width);
}

/** axe's WCAG 2 A/AA rules find nothing (as in accessibility.spec.ts, here with the rail or the opened sidebar). */
async function expectAxeClean(page: Page, what: string): Promise<void> {
  const { violations } = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa']).analyze();
  const found = violations.flatMap((v) => v.nodes.map((n) => `${v.id}: ${n.target.join(' ')} — ${n.failureSummary ?? ''}`));
  expect(found, `${what}:\n${found.join('\n')}`).toEqual([]);
}

/** The page itself does not scroll sideways: wide content scrolls inside its own box. */
async function expectNoSidewaysScroll(page: Page, what: string): Promise<void> {
  const { scrollWidth, clientWidth } = await page.evaluate(() => ({ scrollWidth: document.documentElement.scrollWidth, clientWidth: document.documentElement.clientWidth }));
  expect(scrollWidth, `${what}: page width ${scrollWidth} px in a ${clientWidth} px window`).toBeLessThanOrEqual(clientWidth);
}

async function expectUserMenu(page: Page, what: string): Promise<void> {
  await expectInside(page, page.getByTestId('signed-in-as'), `${what}: the signed-in name`);
  await expectInside(page, page.getByRole('button', { name: 'Sign out' }), `${what}: Sign out`);
}

test('/favicon.ico answers 200 with an icon', async ({ request }) => {
  const res = await request.get('/favicon.ico');
  expect(res.status()).toBe(200);
  const body = await res.body();
  // ICO header: reserved 0, type 1 (icon), then the image count (the ICO file format, common practice).
  expect([...body.subarray(0, 4)]).toEqual([0, 0, 1, 0]);
  expect(body.readUInt16LE(4)).toBeGreaterThan(0);
});

test('at 800 px the sidebar is a rail, the user menu and the main actions stay on screen', async ({ browser }) => {
  test.setTimeout(120_000);
  const context = await browser.newContext({ viewport: NARROW });
  const page = await context.newPage();
  await signInAs(page, DEMO.trainer);

  const toggle = page.getByTestId('sidebar-toggle');
  await expect(toggle).toHaveAttribute('aria-expanded', 'false');
  await expect(mainNav(page).getByRole('link', { name: 'Cells', exact: true })).toBeVisible();
  await expectUserMenu(page, 'the dashboard');
  await expectNoSidewaysScroll(page, 'the dashboard');

  await page.goto('/cells');
  await expect(page.getByTestId('my-cells')).toBeVisible();
  await expectUserMenu(page, 'cells');
  await expectInside(page, page.getByRole('button', { name: 'New cell' }), 'cells: New cell');
  await expectNoSidewaysScroll(page, 'cells');

  const { cells } = (await (await page.request.get('/api/cells')).json()) as { cells: { id: string; name: string }[] };
  const own = cells.find((c) => c.name === DEMO_CELL_NAME) ?? cells[0];
  await page.goto(`/cells/${own.id}`);
  await expect(page.getByTestId('status-strip')).toBeVisible();
  await expectUserMenu(page, 'the workspace');
  await expectInside(page, page.getByRole('button', { name: /^Save/ }).first(), 'the workspace: Save');
  await expectInside(page, page.getByRole('tab', { name: 'Scope' }), 'the workspace: the last area tab');
  await expectNoSidewaysScroll(page, 'the workspace');

  const { drills } = (await (await page.request.get('/api/drills')).json()) as { drills: { id: string }[] };
  await page.goto(`/drills/${drills[0].id}`);
  await expectUserMenu(page, 'the drill editor');
  await expectInside(page, page.getByTestId('save-drill'), 'the drill editor: save');
  await expectNoSidewaysScroll(page, 'the drill editor');

  await page.goto('/gradebook');
  await expect(page.getByTestId('gradebook')).toBeVisible();
  await expectUserMenu(page, 'the gradebook');
  await expectNoSidewaysScroll(page, 'the gradebook');

  await page.goto('/cohorts');
  await expect(page.getByRole('link', { name: DEMO_COHORT })).toBeVisible();
  await expectUserMenu(page, 'cohorts');
  await expectNoSidewaysScroll(page, 'cohorts');
  await context.close();
});

test('at 768 px no page outside the workspace scrolls sideways: wide tables scroll inside themselves', async ({ browser }) => {
  test.setTimeout(120_000);
  const visit = async (page: Page, path: string, ready: Locator) => {
    await page.goto(path);
    await expect(ready).toBeVisible();
    await expectUserMenu(page, path);
    await expectNoSidewaysScroll(page, path);
  };
  const as = async (who: { email: string; password: string }) => {
    const context = await browser.newContext({ viewport: NARROWEST });
    const page = await context.newPage();
    await signInAs(page, who);
    return page;
  };

  const trainer = await as(DEMO.trainer);
  await visit(trainer, '/dashboard', trainer.getByRole('region', { name: 'Your cohorts' }));
  await visit(trainer, '/cells', trainer.getByTestId('my-cells'));
  await visit(trainer, '/drills', trainer.getByTestId('new-drill'));
  await visit(trainer, '/drills/new', trainer.getByTestId('save-drill'));
  await visit(trainer, '/gradebook', trainer.getByTestId('gradebook'));
  await visit(trainer, '/cohorts', trainer.getByRole('link', { name: DEMO_COHORT }));
  await trainer.getByRole('link', { name: DEMO_COHORT }).click();
  await expect(trainer.getByLabel('E-mail addresses')).toBeVisible();
  await expectNoSidewaysScroll(trainer, 'a cohort');
  await visit(trainer, '/plc-link', trainer.getByRole('button', { name: 'Start PLC link' }));
  await trainer.context().close();

  const lead = await as(DEMO.lead);
  await visit(lead, '/changeovers', lead.getByTestId('changeovers-table'));
  await lead.getByTestId('changeovers-table').getByRole('link').first().click();
  await expect(lead.getByTestId('changeover-caution')).toBeVisible();
  await expectUserMenu(lead, 'a changeover');
  await expectNoSidewaysScroll(lead, 'a changeover');
  await lead.context().close();

  const student = await as(DEMO.student);
  await visit(student, '/drills', student.getByRole('heading', { level: 1 }));
  await visit(student, '/runs', student.getByRole('heading', { level: 1 }));
  await student.context().close();

  const admin = await as(DEMO.admin);
  await visit(admin, '/admin/users', admin.getByRole('table', { name: 'Users' }));
  await visit(admin, '/admin/mailbox', admin.getByRole('heading', { level: 1 }));
  await admin.context().close();
});

test('the sidebar toggle works from the keyboard; wide screens keep the reader\'s choice', async ({ browser }) => {
  const narrow = await browser.newContext({ viewport: NARROW });
  const page = await narrow.newPage();
  await signInAs(page, DEMO.lead);
  const toggle = page.getByTestId('sidebar-toggle');
  await expect(toggle).toHaveAttribute('aria-expanded', 'false');
  await expect(toggle).toHaveAccessibleName('Expand the navigation');
  // The rail keeps each link's name for assistive technology, with its label hidden.
  await expect(mainNav(page).getByRole('link', { name: 'Changeovers', exact: true })).toBeVisible();
  await expectAxeClean(page, 'the dashboard with the rail');

  await toggle.focus();
  await page.keyboard.press('Enter');
  await expect(toggle).toHaveAttribute('aria-expanded', 'true');
  await expect(toggle).toHaveAccessibleName('Collapse the navigation');
  await expect(mainNav(page).getByText('Changeovers', { exact: true })).toBeVisible();
  await expectInside(page, mainNav(page), 'the opened sidebar');
  await expectAxeClean(page, 'the dashboard with the sidebar opened over it');
  // On a narrow screen the opened sidebar lies over the page; Escape closes it.
  await page.keyboard.press('Escape');
  await expect(toggle).toHaveAttribute('aria-expanded', 'false');
  await page.keyboard.press('Space');
  await expect(toggle).toHaveAttribute('aria-expanded', 'true');
  await mainNav(page).getByRole('link', { name: 'Changeovers', exact: true }).click();
  await page.waitForURL('**/changeovers');
  await expect(toggle).toHaveAttribute('aria-expanded', 'false');
  await narrow.close();

  const wide = await browser.newContext({ viewport: WIDE });
  const desk = await wide.newPage();
  await signInAs(desk, DEMO.lead);
  const deskToggle = desk.getByTestId('sidebar-toggle');
  await expect(deskToggle).toHaveAttribute('aria-expanded', 'true');
  await expect(mainNav(desk).getByText('Changeovers', { exact: true })).toBeVisible();
  await deskToggle.click();
  await expect(deskToggle).toHaveAttribute('aria-expanded', 'false');
  await desk.reload();
  await expect(desk.getByTestId('sidebar-toggle')).toHaveAttribute('aria-expanded', 'false');
  await desk.getByTestId('sidebar-toggle').click();
  await expect(desk.getByTestId('sidebar-toggle')).toHaveAttribute('aria-expanded', 'true');
  await wide.close();
});
