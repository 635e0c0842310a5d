import { readFileSync, writeFileSync } from 'node:fs';
import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Locator, type Page } from '@playwright/test';
import { DEMO } from './foundation-helpers';
import { STUDENT, newPickAndPlaceCell, openArea, sharedDemoCellId, signIn } from './workspace-helpers';

/*
 * Issue 10, item 7: a logic sheet leaves Cellwright as IEC 61131-3 Structured Text and as an
 * IEC 61131-10 XML document, and the XML comes back in place of the sheet with every block and
 * wire. A broken file names the element it stumbles on and leaves the sheet alone; a run-only
 * workspace may export but not import.
 */

const SHOTS = process.env.E2E_SHOTS_DIR;
/** The exchange document's namespace, as the engine writes it (from memory of IEC 61131-10; docs/engine.md). */
const IEC_NS = 'www.iec.ch/public/TC65SC65BWG7TF10';
const ST_BUTTON = 'Export as Structured Text (.st)';
const XML_BUTTON = 'Export as IEC 61131-10 XML (.xml)';
const IMPORT_LABEL = 'Import XML…';

async function shot(page: Page, name: string, part?: Locator): Promise<void> {
  if (!SHOTS) return;
  if (part) await part.screenshot({ path: `${SHOTS}/${name}.png` });
  else await page.screenshot({ path: `${SHOTS}/${name}.png`, fullPage: true });
}

/** Clicks an export button and returns the downloaded file's name and text. */
async function download(page: Page, button: string): Promise<{ name: string; text: string }> {
  const [file] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: button, exact: true }).click()]);
  return { name: file.suggestedFilename(), text: readFileSync(await file.path(), 'utf8') };
}

/** Opens the Logic area and waits until the sheet is drawn. */
async function openLogic(page: Page): Promise<Locator> {
  await expect(page.getByTestId('engine-status')).toHaveText('ready', { timeout: 30_000 });
  await openArea(page, 'Logic');
  const area = page.getByTestId('logic-area');
  await expect(area).toBeVisible({ timeout: 30_000 });
  return area;
}

test('the sheet exports as Structured Text and XML, and the XML imports back with every block and wire', async ({ page }, testInfo) => {
  test.setTimeout(120_000);
  await signIn(page, DEMO.trainer);
  const stamp = Date.now();
  const id = await newPickAndPlaceCell(page, `Logic exchange ${stamp}`);
  try {
    await page.goto(`/cells/${id}`);
    const area = await openLogic(page);
    const counts = area.getByText(/^\d+ blocks · \d+ wires$/);
    const original = (await counts.textContent())!;
    expect(original).toMatch(/^[1-9]\d* blocks · [1-9]\d* wires$/);
    await expect(area.getByTestId('block-startPB')).toBeVisible();

    // Structured Text: a header comment, then the PROGRAM with the demo's located start button.
    const st = await download(page, ST_BUTTON);
    expect(st.name).toBe(`logic-exchange-${stamp}-logic.st`);
    expect(st.text).toMatch(/^\(\* Logic exchange \d+\n/);
    expect(st.text.replace(/^\(\*[\s\S]*?\*\)\s*/, '')).toMatch(/^PROGRAM CellLogic\n/);
    expect(st.text).toContain('IX0_0 AT %IX0.0 : BOOL; (* startPB *)');
    expect(st.text.trimEnd().endsWith('END_PROGRAM')).toBe(true);
    await expect(page.getByTestId('sheet-files-status')).toHaveText(`Downloaded ${st.name} (Structured Text).`);

    // XML: well-formed for the browser's own parser, a <project> in the exchange namespace with one program.
    const xml = await download(page, XML_BUTTON);
    expect(xml.name).toBe(`logic-exchange-${stamp}-logic.xml`);
    const parsed = await page.evaluate(
      ([text, ns]) => {
        const doc = new DOMParser().parseFromString(text, 'application/xml');
        return {
          parserErrors: doc.getElementsByTagName('parsererror').length,
          root: doc.documentElement.localName,
          ns: doc.documentElement.namespaceURI,
          // The start button's contact reads %IX0.0 through an inVariable.
          startPB: [...doc.getElementsByTagNameNS(ns, 'inVariable')].some((v) => v.getElementsByTagNameNS(ns, 'expression')[0]?.textContent === '%IX0.0'),
          programs: [...doc.getElementsByTagNameNS(ns, 'pou')].filter((p) => p.getAttribute('pouType') === 'program').length,
        };
      },
      [xml.text, IEC_NS] as const,
    );
    expect(parsed).toEqual({ parserErrors: 0, root: 'project', ns: IEC_NS, startPB: true, programs: 1 });

    // Delete the start button's contact: one block fewer.
    await area.getByTestId('block-startPB').click();
    await page.getByTestId('block-inspector').getByRole('button', { name: 'Delete block' }).click();
    await expect(area.getByTestId('block-startPB')).toHaveCount(0);
    await expect(counts).not.toHaveText(original);
    const [blocks, wires] = original.match(/\d+/g)!.map(Number);
    const shorter = (await counts.textContent())!;
    const [blocksAfter, wiresAfter] = shorter.match(/\d+/g)!.map(Number);
    expect(blocksAfter).toBe(blocks - 1);

    // Import the exported XML (under its download name): a confirmation names both sheets, the keep button has focus.
    const xmlPath = testInfo.outputPath(xml.name);
    writeFileSync(xmlPath, xml.text);
    await page.getByLabel(IMPORT_LABEL).setInputFiles(xmlPath);
    const confirm = page.getByRole('alertdialog', { name: 'Replace the logic sheet?' });
    await expect(confirm).toContainText(`The current sheet (${blocksAfter} blocks and ${wiresAfter} wires) will be replaced by the sheet in`);
    await expect(confirm).toContainText(`will be replaced by the sheet in “${xml.name}” (${blocks} blocks and ${wires} wires).`);
    await expect(confirm.getByRole('button', { name: 'Keep the current sheet' })).toBeFocused();
    await shot(page, 'logic-exchange-confirm', area);
    await confirm.getByRole('button', { name: 'Replace the sheet' }).click();
    await expect(confirm).toHaveCount(0);
    await expect(counts).toHaveText(original);
    await expect(area.getByTestId('block-startPB')).toBeVisible();
    await expect(page.getByTestId('sheet-files-status')).toContainText(`Imported ${blocks} blocks and ${wires} wires`);

    // One undo step, like any edit; the document is unsaved until saved.
    await page.getByRole('button', { name: /^Undo Import sheet from / }).click();
    await expect(counts).toHaveText(shorter);
    await page.getByRole('button', { name: /^Redo Import sheet from / }).click();
    await expect(counts).toHaveText(original);
    await expect(page.getByTestId('version-label')).toContainText('unsaved changes');

    // A broken file: a wire naming an element that does not exist. The list names the element and the sheet stays.
    const first = xml.text.search(/refLocalId="\d+"/);
    const owner = [...xml.text.slice(0, first).matchAll(/<(\w+) localId="(\d+)"/g)].at(-1)!;
    const brokenPath = testInfo.outputPath('broken-logic.xml');
    writeFileSync(brokenPath, xml.text.slice(0, first) + xml.text.slice(first).replace(/refLocalId="\d+"/, 'refLocalId="99999"'));
    await page.getByLabel(IMPORT_LABEL).setInputFiles(brokenPath);
    const problems = page.getByTestId('sheet-files-problems');
    await expect(problems).toBeFocused();
    await expect(problems.getByRole('heading')).toHaveText('Not imported: “broken-logic.xml” has 1 problem');
    await expect(problems.getByRole('listitem')).toHaveText([new RegExp(`^${owner[1]} localId ${owner[2]} › .*: refLocalId 99999 names no element$`)]);
    await expect(page.getByRole('alertdialog')).toHaveCount(0);
    await expect(counts).toHaveText(original);
    await expect(page.getByRole('button', { name: /^Undo Import sheet from / })).toBeVisible();
    await shot(page, 'logic-exchange-problems', area);
    const { violations } = await new AxeBuilder({ page }).include('[data-testid="logic-area"]').withTags(['wcag2a', 'wcag2aa']).analyze();
    expect(violations.flatMap((v) => v.nodes.map((n) => `${v.id}: ${n.target.join(' ')}`))).toEqual([]);

    // Too large a file is refused before it is read.
    await page.getByLabel(IMPORT_LABEL).setInputFiles({ name: 'huge.xml', mimeType: 'application/xml', buffer: Buffer.alloc(2 * 1024 * 1024 + 1, 0x20) });
    await expect(problems.getByRole('listitem')).toHaveText(['huge.xml: “huge.xml” is 2.0 MB; the import reads files up to 2.0 MB.']);
    await expect(problems).toBeFocused();
    await problems.getByRole('button', { name: 'Close the problem list' }).click();
    await expect(problems).toHaveCount(0);
    await expect(page.getByLabel(IMPORT_LABEL)).toBeFocused();

    // Saved, the imported sheet is the cell's next version.
    await page.getByRole('button', { name: 'Save', exact: true }).click();
    await page.getByLabel('What changed?').fill('Sheet imported back from its own XML');
    await page.getByRole('button', { name: 'Save version' }).click();
    await expect(page.getByTestId('version-label')).toHaveText('version 2');
    await page.reload();
    const again = await openLogic(page);
    await expect(again.getByText(/^\d+ blocks · \d+ wires$/)).toHaveText(original);

    // At 768 px the toolbar wraps and every sheet-file control stays inside the window.
    await page.setViewportSize({ width: 768, height: 1000 });
    for (const control of [page.getByRole('button', { name: ST_BUTTON }), page.getByRole('button', { name: XML_BUTTON }), page.getByText(IMPORT_LABEL, { exact: true })]) {
      await expect(control).toBeVisible();
      const box = (await control.boundingBox())!;
      expect(box.x).toBeGreaterThanOrEqual(0);
      expect(box.x + box.width).toBeLessThanOrEqual(768);
    }
    await shot(page, 'logic-exchange-768', page.getByTestId('logic-area'));
  } finally {
    await page.request.delete(`/api/cells/${id}`);
  }
});

test('a run-only workspace exports the sheet but offers no import', async ({ page }) => {
  await signIn(page, STUDENT);
  const id = await sharedDemoCellId(page);
  await page.goto(`/cells/${id}`);
  const area = await openLogic(page);
  await expect(page.getByRole('group', { name: 'Sheet files' })).toBeVisible();
  await expect(page.getByLabel(IMPORT_LABEL)).toHaveCount(0);
  const st = await download(page, ST_BUTTON);
  expect(st.name).toBe('kestrel-vale-cell-b-pick-and-place-logic.st');
  expect(st.text).toMatch(/^PROGRAM CellLogic$/m);
  await shot(page, 'logic-exchange-run-only', area);
});
