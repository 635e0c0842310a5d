/**
 * Cells routes against the real test database: lifecycle, stale saves, JSON import and
 * export, sharing and student copies, CSV import (every row's error, nothing written) and
 * CSV round trips, and the demo seed.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import * as cells from '@/app/api/cells/route';
import * as cellImport from '@/app/api/cells/import/route';
import * as csvTemplates from '@/app/api/cells/csv-templates/[kind]/route';
import * as cell from '@/app/api/cells/[id]/route';
import * as duplicate from '@/app/api/cells/[id]/duplicate/route';
import * as versions from '@/app/api/cells/[id]/versions/route';
import * as version from '@/app/api/cells/[id]/versions/[version]/route';
import * as shares from '@/app/api/cells/[id]/shares/route';
import * as share from '@/app/api/cells/[id]/shares/[cohortId]/route';
import * as copy from '@/app/api/cells/[id]/copy/route';
import * as exportJson from '@/app/api/cells/[id]/export/route';
import * as csv from '@/app/api/cells/[id]/csv/[kind]/route';
import { closeDb, db } from '@/db/knex';
import type { User } from '@/db/users';
import { countVersions, getVersion } from '@/db/cells';
import { listCohorts } from '@/db/cohorts';
import { DEMO_COHORT, seedDemo } from '@/db/seeds/demo';
import { DEMO_CELL_NAMES } from '@/db/seeds/demo-cells';
import { CELL_TEMPLATES, templateDocument } from '@/lib/cells/templates';
import { csvTemplate } from '@/lib/cells/csv';
import { cellDocumentSchema, pickAndPlaceCell, starterCell, validateCellDocument } from '@/simulator';
import type { CellDocument } from '@/simulator';
import { BASE, call, demoUser, makeUser, otherTrainerWithCohort, sessionCookie } from './helpers';

type Json = Record<string, unknown>;
interface CellDto {
  id: string;
  name: string;
  ownerId: string;
  origin: string;
  sourceCellId: string | null;
  latestVersion: number;
}

let trainer: User;
let student: User;
let lead: User;
let cohortId: string;
const cookie: Record<string, string> = {};

beforeAll(async () => {
  trainer = await demoUser('trainer@kestrelvale.test');
  student = await demoUser('ada.lindqvist@kestrelvale.test');
  lead = await demoUser('lead@brennick.test');
  // By name: other test files create more cohorts for the demo trainer.
  cohortId = (await listCohorts(trainer.id)).find((c) => c.name === DEMO_COHORT)!.id;
  for (const u of [trainer, student, lead]) cookie[u.id] = await sessionCookie(u);
});

afterAll(async () => {
  await closeDb();
});

/** Raw call for routes that answer with a file (CSV, JSON download). */
async function fetchText(handler: unknown, path: string, params: Record<string, string>, who: User): Promise<{ status: number; text: string; headers: Headers }> {
  const req = new Request(`${BASE}${path}`, { headers: { cookie: cookie[who.id] } });
  const res = await (handler as (r: Request, c: { params: Promise<Record<string, string>> }) => Promise<Response>)(req, { params: Promise.resolve(params) });
  return { status: res.status, text: await res.text(), headers: res.headers };
}

async function create(who: User, template: (typeof CELL_TEMPLATES)[number] = 'pick-and-place', name = 'Test cell'): Promise<CellDto> {
  const res = await call(cells.POST, '/api/cells', { method: 'POST', cookie: cookie[who.id], body: { name, template } });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return (res.body as { cell: CellDto }).cell;
}

async function latestDocument(id: string): Promise<CellDocument> {
  return (await getVersion(id))!.document;
}

describe('templates', () => {
  it.each(CELL_TEMPLATES)('%s passes the engine validation in full', (t) => {
    const r = validateCellDocument(templateDocument(t, 'Check'));
    expect(r.ok, r.ok ? '' : JSON.stringify(r.errors)).toBe(true);
  });
});

describe('cell lifecycle', () => {
  it('creates from a template, lists, renames, duplicates and deletes', async () => {
    const made = await create(trainer, 'panel-starter', 'Lifecycle cell');
    expect(made.latestVersion).toBe(1);
    expect(made.ownerId).toBe(trainer.id);

    const got = await call(cell.GET, `/api/cells/${made.id}`, { cookie: cookie[trainer.id], params: { id: made.id } });
    expect(got.status).toBe(200);
    const body = got.body as { access: string; version: { version: number; document: CellDocument } };
    expect(body.access).toBe('owner');
    expect(body.version.version).toBe(1);
    expect(body.version.document.name).toBe('Lifecycle cell');
    expect(body.version.document.panel.map((d) => d.id)).toEqual(starterCell.panel.map((d) => d.id));

    const renamed = await call(cell.PATCH, `/api/cells/${made.id}`, { method: 'PATCH', cookie: cookie[trainer.id], params: { id: made.id }, body: { name: '  Renamed cell ' } });
    expect(renamed.status).toBe(200);
    expect((renamed.body as { cell: CellDto }).cell.name).toBe('Renamed cell');

    const bad = await call(cell.PATCH, `/api/cells/${made.id}`, { method: 'PATCH', cookie: cookie[trainer.id], params: { id: made.id }, body: { name: '' } });
    expect(bad.status).toBe(422);
    expect((bad.body as { fields: Json }).fields).toHaveProperty('name');

    const dup = await call(duplicate.POST, `/api/cells/${made.id}/duplicate`, { method: 'POST', cookie: cookie[trainer.id], params: { id: made.id }, body: {} });
    expect(dup.status).toBe(201);
    const dupCell = (dup.body as { cell: CellDto }).cell;
    expect(dupCell.name).toBe('Renamed cell (copy)');
    expect(dupCell.sourceCellId).toBe(made.id);
    expect(await latestDocument(dupCell.id)).toEqual(await latestDocument(made.id));

    const del = await call(cell.DELETE, `/api/cells/${made.id}`, { method: 'DELETE', cookie: cookie[trainer.id], params: { id: made.id } });
    expect(del.status).toBe(200);
    const after = await call(cell.GET, `/api/cells/${made.id}`, { cookie: cookie[trainer.id], params: { id: made.id } });
    expect(after.status).toBe(404);
    const list = await call(cells.GET, '/api/cells', { cookie: cookie[trainer.id] });
    const ids = (list.body as { cells: CellDto[] }).cells.map((c) => c.id);
    expect(ids).toContain(dupCell.id);
    expect(ids).not.toContain(made.id);
  });

  it('refuses an unknown template with the field named', async () => {
    const res = await call(cells.POST, '/api/cells', { method: 'POST', cookie: cookie[trainer.id], body: { name: 'X', template: 'factory' } });
    expect(res.status).toBe(422);
    expect((res.body as { fields: Json }).fields).toHaveProperty('template');
  });

  it('hides another owner’s cell (404) and refuses admins (403)', async () => {
    const mine = await create(trainer);
    const other = await makeUser('trainer');
    const res = await call(cell.GET, `/api/cells/${mine.id}`, { cookie: await sessionCookie(other), params: { id: mine.id } });
    expect(res.status).toBe(404);
    const admin = await demoUser('admin@kestrelvale.test');
    const res2 = await call(cells.GET, '/api/cells', { cookie: await sessionCookie(admin) });
    expect(res2.status).toBe(403);
  });
});

describe('saving versions', () => {
  it('a stale save gets 409 with the latest version, writes nothing, and the kept document saves on top', async () => {
    const made = await create(trainer);
    const base = await latestDocument(made.id);
    const first: CellDocument = { ...base, description: 'edited in window A' };
    const second: CellDocument = { ...base, description: 'edited in window B' };

    const a = await call(versions.POST, `/api/cells/${made.id}/versions`, { method: 'POST', cookie: cookie[trainer.id], params: { id: made.id }, body: { baseVersion: 1, document: first, message: 'A' } });
    expect(a.status, JSON.stringify(a.body)).toBe(201);
    expect((a.body as { version: { version: number } }).version.version).toBe(2);

    const b = await call(versions.POST, `/api/cells/${made.id}/versions`, { method: 'POST', cookie: cookie[trainer.id], params: { id: made.id }, body: { baseVersion: 1, document: second, message: 'B' } });
    expect(b.status).toBe(409);
    expect(b.body).toMatchObject({ latestVersion: 2 });
    expect((b.body as { error: string }).error).toMatch(/version 2/);
    expect(await countVersions(made.id)).toBe(2);
    expect((await latestDocument(made.id)).description).toBe('edited in window A');

    // Nothing lost: the client still holds `second` and saves it on top of version 2.
    const c = await call(versions.POST, `/api/cells/${made.id}/versions`, { method: 'POST', cookie: cookie[trainer.id], params: { id: made.id }, body: { baseVersion: 2, document: second, message: 'B again' } });
    expect(c.status).toBe(201);
    expect((await latestDocument(made.id)).description).toBe('edited in window B');

    const list = await call(versions.GET, `/api/cells/${made.id}/versions`, { cookie: cookie[trainer.id], params: { id: made.id } });
    const metas = (list.body as { versions: { version: number; message: string; authorName: string }[] }).versions;
    expect(metas.map((v) => v.version)).toEqual([3, 2, 1]);
    expect(metas[0]).toMatchObject({ message: 'B again', authorName: trainer.name });

    const v2 = await call(version.GET, `/api/cells/${made.id}/versions/2`, { cookie: cookie[trainer.id], params: { id: made.id, version: '2' } });
    expect((v2.body as { version: { document: CellDocument } }).version.document.description).toBe('edited in window A');
  });

  it('two saves racing on the same base: exactly one wins', async () => {
    const made = await create(trainer);
    const doc = await latestDocument(made.id);
    const save = (d: string) =>
      call(versions.POST, `/api/cells/${made.id}/versions`, { method: 'POST', cookie: cookie[trainer.id], params: { id: made.id }, body: { baseVersion: 1, document: { ...doc, description: d } } });
    const results = await Promise.all([save('x'), save('y'), save('z')]);
    expect(results.map((r) => r.status).sort()).toEqual([201, 409, 409]);
    expect(await countVersions(made.id)).toBe(2);
  });

  it('a document that does not fit the schema is 422 with each problem’s path; cross-reference problems save and are listed', async () => {
    const made = await create(trainer);
    const doc = await latestDocument(made.id);
    const broken = structuredClone(doc) as unknown as Json & { panel: Json[]; controller: { pointMap: Json[] } };
    broken.panel[0].colour = 'purple';
    broken.controller.pointMap[0].rack = 99;
    const res = await call(versions.POST, `/api/cells/${made.id}/versions`, { method: 'POST', cookie: cookie[trainer.id], params: { id: made.id }, body: { baseVersion: 1, document: broken } });
    expect(res.status).toBe(422);
    const fields = (res.body as { fields: Record<string, string[]> }).fields;
    expect(Object.keys(fields)).toEqual(expect.arrayContaining(['panel.0.colour', 'controller.pointMap.0.rack']));
    expect(await countVersions(made.id)).toBe(1);

    // A wire to a device that does not exist is a cross-reference problem: work in progress, saved.
    const dangling: CellDocument = { ...doc, wiring: [...doc.wiring, { id: 'w-ghost', from: { device: 'ghost', terminal: 'contact' }, to: { plc: '%IX0.7' } }] };
    const ok = await call(versions.POST, `/api/cells/${made.id}/versions`, { method: 'POST', cookie: cookie[trainer.id], params: { id: made.id }, body: { baseVersion: 1, document: dangling } });
    expect(ok.status).toBe(201);
    const problems = (ok.body as { problems: { path: (string | number)[] }[] }).problems;
    expect(problems.some((p) => p.path[0] === 'wiring' && p.path[1] === doc.wiring.length)).toBe(true);
  });
});

describe('JSON import and export', () => {
  it('exports a cell that imports back unchanged', async () => {
    const made = await create(trainer);
    const exported = await fetchText(exportJson.GET, `/api/cells/${made.id}/export`, { id: made.id }, trainer);
    expect(exported.status).toBe(200);
    expect(exported.headers.get('content-disposition')).toMatch(/attachment; filename="test-cell-v1\.json"/);
    const document = JSON.parse(exported.text);
    const res = await call(cellImport.POST, '/api/cells/import', { method: 'POST', cookie: cookie[trainer.id], body: { document, name: 'Imported copy' } });
    expect(res.status).toBe(201);
    const imported = (res.body as { cell: CellDto }).cell;
    expect(imported.origin).toBe('import');
    expect(await latestDocument(imported.id)).toEqual({ ...document, name: 'Imported copy' });
  });

  it('refuses a broken document with 422 and every problem’s path, writing nothing', async () => {
    const before = Number((await db()('cells').count<{ n: string }[]>({ n: '*' }))[0].n);
    const document = structuredClone(pickAndPlaceCell) as unknown as Json & { schemaVersion: number; panel: Json[]; controller: { poses: Json[] } };
    document.schemaVersion = 99; // no such version (2 is the current one, 1 is upgraded)
    document.panel[1].contact = 'NX';
    document.controller.poses[0].speed = -1;
    const res = await call(cellImport.POST, '/api/cells/import', { method: 'POST', cookie: cookie[student.id], body: { document } });
    expect(res.status).toBe(422);
    const fields = (res.body as { fields: Record<string, string[]> }).fields;
    expect(Object.keys(fields)).toEqual(expect.arrayContaining(['schemaVersion', 'panel.1.contact', 'controller.poses.0.speed']));
    const after = Number((await db()('cells').count<{ n: string }[]>({ n: '*' }))[0].n);
    expect(after).toBe(before);
  });

  it('a body that is not JSON is 400', async () => {
    const res = await call(cellImport.POST, '/api/cells/import', { method: 'POST', cookie: cookie[trainer.id], rawBody: '{not json' });
    expect(res.status).toBe(400);
  });
});

describe('sharing with a cohort and student copies', () => {
  it('a student sees a shared cell, opens one copy of it, cannot save the original; unsharing keeps the copy', async () => {
    const made = await create(trainer, 'pick-and-place', 'Shared for class');
    const shared = await call(shares.POST, `/api/cells/${made.id}/shares`, { method: 'POST', cookie: cookie[trainer.id], params: { id: made.id }, body: { cohortId } });
    expect(shared.status).toBe(200);
    expect((shared.body as { shares: { cohortId: string }[] }).shares.map((s) => s.cohortId)).toEqual([cohortId]);

    const list = await call(cells.GET, '/api/cells', { cookie: cookie[student.id] });
    const entry = (list.body as { shared: { id: string; myCopyId: string | null }[] }).shared.find((s) => s.id === made.id);
    expect(entry).toBeDefined();
    expect(entry!.myCopyId).toBeNull();

    const read = await call(cell.GET, `/api/cells/${made.id}`, { cookie: cookie[student.id], params: { id: made.id } });
    expect(read.status).toBe(200);
    expect((read.body as { access: string }).access).toBe('shared');
    const save = await call(versions.POST, `/api/cells/${made.id}/versions`, {
      method: 'POST',
      cookie: cookie[student.id],
      params: { id: made.id },
      body: { baseVersion: 1, document: await latestDocument(made.id) },
    });
    expect(save.status).toBe(403);

    const first = await call(copy.POST, `/api/cells/${made.id}/copy`, { method: 'POST', cookie: cookie[student.id], params: { id: made.id } });
    expect(first.status).toBe(201);
    const mine = (first.body as { cell: CellDto }).cell;
    expect(mine).toMatchObject({ ownerId: student.id, origin: 'shared-copy', sourceCellId: made.id, name: 'Shared for class' });
    expect(await latestDocument(mine.id)).toEqual(await latestDocument(made.id));
    const again = await call(copy.POST, `/api/cells/${made.id}/copy`, { method: 'POST', cookie: cookie[student.id], params: { id: made.id } });
    expect(again.status).toBe(200);
    expect((again.body as { cell: CellDto }).cell.id).toBe(mine.id);

    const unshare = await call(share.DELETE, `/api/cells/${made.id}/shares/${cohortId}`, { method: 'DELETE', cookie: cookie[trainer.id], params: { id: made.id, cohortId } });
    expect(unshare.status).toBe(200);
    const list2 = await call(cells.GET, '/api/cells', { cookie: cookie[student.id] });
    const body2 = list2.body as { cells: CellDto[]; shared: { id: string }[] };
    expect(body2.shared.map((s) => s.id)).not.toContain(made.id);
    expect(body2.cells.map((c) => c.id)).toContain(mine.id);
    const gone = await call(cell.GET, `/api/cells/${made.id}`, { cookie: cookie[student.id], params: { id: made.id } });
    expect(gone.status).toBe(404);
  });

  it('a trainer cannot share with another trainer’s cohort; a lead may share with any cohort', async () => {
    const made = await create(trainer);
    const other = await otherTrainerWithCohort();
    const refused = await call(shares.POST, `/api/cells/${made.id}/shares`, { method: 'POST', cookie: cookie[trainer.id], params: { id: made.id }, body: { cohortId: other.cohortId } });
    expect(refused.status).toBe(403);
    const missing = await call(shares.POST, `/api/cells/${made.id}/shares`, {
      method: 'POST',
      cookie: cookie[trainer.id],
      params: { id: made.id },
      body: { cohortId: '00000000-0000-4000-8000-000000000000' },
    });
    expect(missing.status).toBe(422);

    const leads = await create(lead);
    const ok = await call(shares.POST, `/api/cells/${leads.id}/shares`, { method: 'POST', cookie: cookie[lead.id], params: { id: leads.id }, body: { cohortId: other.cohortId } });
    expect(ok.status).toBe(200);
    const options = await call(shares.GET, `/api/cells/${leads.id}/shares`, { cookie: cookie[lead.id], params: { id: leads.id } });
    expect((options.body as { cohorts: { cohortId: string }[] }).cohorts.map((c) => c.cohortId)).toEqual(expect.arrayContaining([cohortId, other.cohortId]));
  });
});

describe('CSV import and export', () => {
  const importCsv = (who: User, id: string, kind: string, text: string, baseVersion: number) =>
    call(csv.POST, `/api/cells/${id}/csv/${kind}`, { method: 'POST', cookie: cookie[who.id], params: { id, kind }, body: { baseVersion, csv: text } });

  it('a point-map CSV with bad rows reports every row’s error (row, column, message) and writes no version', async () => {
    const made = await create(trainer);
    // Row numbers count the header as row 1, as a spreadsheet shows them (common practice).
    const text = [
      'row_id,family,first_point,count,rack,slot,first_channel,bits,encoding,labels,invert',
      'pm-di,DI,1,6,1,2,0,,,Start|Stop|Reset|Guard|E-stop|Part,', // row 2: good
      'pm-bad-rack,DO,1,7,x,3,0,,,,', // row 3: rack is not a number
      'pm-bad-family,ZZ,1,1,1,3,8,,,,', // row 4: unknown family
      'pm-no-module,DO,20,1,1,9,0,,,,', // row 5: no module in rack 1 slot 9 (cross-check)
      'pm-to,TO,1,1,1,4,0,,,Gripper close,', // row 6: good
    ].join('\n');
    const res = await importCsv(trainer, made.id, 'point-map', text, 1);
    expect(res.status).toBe(422);
    const body = res.body as { error: string; fields: Record<string, string[]>; rowErrors: { row: number; column: string; message: string }[] };
    expect(body.error).toMatch(/3 rows have problems; nothing was imported/);
    expect(body.rowErrors.map((e) => [e.row, e.column])).toEqual([
      [3, 'rack'],
      [4, 'family'],
      [5, 'slot'],
    ]);
    for (const e of body.rowErrors) expect(e.message.length).toBeGreaterThan(5);
    expect(Object.keys(body.fields)).toEqual(['rows.3.rack', 'rows.4.family', 'rows.5.slot']);
    expect(await countVersions(made.id)).toBe(1);
    expect((await latestDocument(made.id)).controller.staged).toBeNull();
  });

  it('an I/O-list CSV with bad rows reports every row’s error and writes no version', async () => {
    const made = await create(trainer);
    const text = [
      'wire_id,from,to,bits,description',
      'w-start,start:contact,%IX0.0,,Start', // good
      'w-ghost,ghost:contact,%IX0.7,,No such device', // row 3: unknown device (cross-check)
      'w-addr,stop:contact,%IX99999,,Bad address', // row 4: not an address
      'w-pt,DO40,%IX1.7,,Unmapped point', // row 5: point not mapped
      'w-dup,part:out,%IX0.0,,Second wire into %IX0.0', // row 6: two wires drive one input
    ].join('\r\n');
    const res = await importCsv(trainer, made.id, 'io-list', text, 1);
    expect(res.status).toBe(422);
    const body = res.body as { rowErrors: { row: number; column: string; message: string }[] };
    expect(body.rowErrors.map((e) => e.row)).toEqual([3, 4, 5, 6]);
    expect(body.rowErrors.find((e) => e.row === 4)?.column).toBe('to');
    expect(body.rowErrors.find((e) => e.row === 5)?.column).toBe('from');
    expect(body.rowErrors.find((e) => e.row === 5)?.message).toMatch(/DO40 is not mapped/);
    expect(await countVersions(made.id)).toBe(1);
  });

  it('a header problem is reported on row 1', async () => {
    const made = await create(trainer);
    const res = await importCsv(trainer, made.id, 'point-map', 'family,first,count\nDI,1,1\n', 1);
    expect(res.status).toBe(422);
    const errs = (res.body as { rowErrors: { row: number; column: string }[] }).rowErrors;
    expect(errs.filter((e) => e.row === 1).map((e) => e.column)).toEqual(expect.arrayContaining(['first', 'first_point', 'rack', 'slot', 'first_channel']));
    expect(await countVersions(made.id)).toBe(1);
  });

  it('point map round trip: export → import lands as staged rows equal to the live map → export again is identical', async () => {
    const made = await create(trainer);
    const live = await fetchText(csv.GET, `/api/cells/${made.id}/csv/point-map`, { id: made.id, kind: 'point-map' }, trainer);
    expect(live.status).toBe(200);
    expect(live.headers.get('content-type')).toMatch(/text\/csv/);
    const parsed = Papa.parse<string[]>(live.text.trim());
    // One header + one line per point-map row of the demo cell.
    expect(parsed.data.length).toBe(1 + pickAndPlaceCell.controller.pointMap.length);

    const res = await importCsv(trainer, made.id, 'point-map', live.text, 1);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect((res.body as { version: { version: number }; count: number }).count).toBe(pickAndPlaceCell.controller.pointMap.length);
    const doc = await latestDocument(made.id);
    expect(doc.controller.staged).toEqual(doc.controller.pointMap);
    expect(doc.controller.pointMap).toEqual(cellDocumentSchema.parse(pickAndPlaceCell).controller.pointMap);

    const staged = await fetchText(csv.GET, `/api/cells/${made.id}/csv/point-map?rows=staged`, { id: made.id, kind: 'point-map' }, trainer);
    expect(staged.text).toBe(live.text);
  });

  it('I/O list round trip: export → import → identical wiring and identical export', async () => {
    const made = await create(trainer);
    const first = await fetchText(csv.GET, `/api/cells/${made.id}/csv/io-list`, { id: made.id, kind: 'io-list' }, trainer);
    const res = await importCsv(trainer, made.id, 'io-list', first.text, 1);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(await countVersions(made.id)).toBe(2);
    const before = (await getVersion(made.id, 1))!.document;
    expect((await latestDocument(made.id)).wiring).toEqual(before.wiring);
    const second = await fetchText(csv.GET, `/api/cells/${made.id}/csv/io-list`, { id: made.id, kind: 'io-list' }, trainer);
    expect(second.text).toBe(first.text);
  });

  it('the downloadable templates import cleanly into the demo cell; points resolve through the live map', async () => {
    const made = await create(trainer);
    for (const kind of ['point-map', 'io-list'] as const) {
      const t = await fetchText(csvTemplates.GET, `/api/cells/csv-templates/${kind}`, { kind }, student);
      expect(t.status).toBe(200);
      expect(t.text).toBe(csvTemplate(kind));
    }
    const pm = await importCsv(trainer, made.id, 'point-map', csvTemplate('point-map'), 1);
    expect(pm.status, JSON.stringify(pm.body)).toBe(201);
    const io = await importCsv(trainer, made.id, 'io-list', csvTemplate('io-list'), 2);
    expect(io.status, JSON.stringify(io.body)).toBe(201);
    const doc = await latestDocument(made.id);
    // DO1 of the demo's live map is rack 1, slot 3, channel 0 (simulator/demo/pick-and-place.ts, row pm-do).
    expect(doc.wiring.find((w) => w.id === 'l-ready')?.from).toEqual({ controller: { rack: 1, slot: 3, channel: 0 } });
    expect(doc.controller.staged?.find((r) => r.id === 'pm-do')?.points?.[2]).toEqual({ label: 'Fault', invert: true });
  });

  it('a CSV import on a stale base version is 409 and writes nothing', async () => {
    const made = await create(trainer);
    const doc = await latestDocument(made.id);
    await call(versions.POST, `/api/cells/${made.id}/versions`, { method: 'POST', cookie: cookie[trainer.id], params: { id: made.id }, body: { baseVersion: 1, document: doc } });
    const res = await importCsv(trainer, made.id, 'point-map', csvTemplate('point-map'), 1);
    expect(res.status).toBe(409);
    expect(res.body).toMatchObject({ latestVersion: 2 });
    expect(await countVersions(made.id)).toBe(2);
  });
});

describe('demo seed', () => {
  it('gives the trainer two cells shared with the demo cohort and the lead a copy, once', async () => {
    const trainerCells = await db()('cells').where({ owner_id: trainer.id }).whereIn('name', [DEMO_CELL_NAMES.pickAndPlace, DEMO_CELL_NAMES.panelStarter]);
    expect(trainerCells).toHaveLength(2);
    const shareRows = await db()('cell_shares').whereIn('cell_id', trainerCells.map((c) => c.id)).where({ cohort_id: cohortId });
    expect(shareRows).toHaveLength(2);
    const leadCopy = await db()('cells').where({ owner_id: lead.id, name: DEMO_CELL_NAMES.leadCopy }).first();
    expect(leadCopy.source_cell_id).toBe(trainerCells.find((c) => c.name === DEMO_CELL_NAMES.pickAndPlace).id);

    const count = async () => Number((await db()('cells').count<{ n: string }[]>({ n: '*' }))[0].n);
    const before = await count();
    await seedDemo(db());
    expect(await count()).toBe(before);
  });
});
