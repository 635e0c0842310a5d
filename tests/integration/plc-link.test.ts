/**
 * PLC link (issue 13, point 2): a Modbus TCP client in the test process plays the real PLC and
 * drives the pick-and-place demo cell through a full handshake cycle; the register map matches
 * the document; a silent PLC is a lost link (coils drop, the session says so) and recovers; one
 * port, one session; the PLC's writes are stored as a run that replays.
 *
 * Function codes and exception codes: MODBUS Application Protocol Specification V1.1b3
 * (§6.1 FC 01 read coils, §6.2 FC 02 read discrete inputs, §6.3 FC 03, §6.4 FC 04, §6.5 FC 05,
 * §6.6 FC 06, §6.11 FC 15, §6.12 FC 16; §7 exception 02 ILLEGAL DATA ADDRESS).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import ModbusRTU from 'modbus-serial';
import * as links from '@/app/api/plc-links/route';
import * as link from '@/app/api/plc-links/[id]/route';
import * as mapRoute from '@/app/api/plc-links/[id]/register-map/route';
import { closeDb } from '@/db/knex';
import { createCell } from '@/db/cells';
import { findRun, listBatches } from '@/db/runs';
import type { User } from '@/db/users';
import { cellDocumentSchema, pickAndPlaceCell, replay, type CellDocument } from '@/simulator';
import { templateDocument } from '@/lib/cells/templates';
import { registerMap } from '@/lib/plc-link/register-map';
import { sessionsOf, startSession, stopAllSessions, watchNow } from '@/lib/plc-link/sessions';
import { db } from '@/db/knex';
import type { PlcLinkView } from '@/lib/plc-link/sessions';
import { call, demoUser, makeUser, sessionCookie } from './helpers';

const PORT = 15021;
const OTHER_PORT = 15022;
const TIMEOUT_MS = 400;

let trainer: User;
let lead: User;
let trainerCookie: string;
let leadCookie: string;
let cellId: string;
let document: CellDocument;
let client: ModbusRTU;
let session: PlcLinkView;

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Polls a discrete input (FC 02) every 20 ms until it reads `want`, like a PLC scanning. */
async function waitForInput(offset: number, want: boolean, withinMs: number): Promise<number> {
  const t0 = Date.now();
  while (Date.now() - t0 < withinMs) {
    const r = await client.readDiscreteInputs(offset, 1);
    if (r.data[0] === want) return Date.now() - t0;
    await sleep(20);
  }
  throw new Error(`discrete input ${offset} did not read ${want} within ${withinMs} ms`);
}

async function view(id: string): Promise<PlcLinkView> {
  const r = await call(link.GET, `/api/plc-links/${id}`, { cookie: trainerCookie, params: { id } });
  expect(r.status).toBe(200);
  return (r.body as { session: PlcLinkView }).session;
}

beforeAll(async () => {
  trainer = await demoUser('trainer@kestrelvale.test');
  lead = await makeUser('lead');
  trainerCookie = await sessionCookie(trainer);
  leadCookie = await sessionCookie(lead);
  // The demo cell with a part already at the pick station (the routine waits for one).
  const base = cellDocumentSchema.parse(templateDocument('pick-and-place', 'PLC link bench'));
  document = cellDocumentSchema.parse({ ...base, initial: { ...base.initial, devices: { ...base.initial.devices, part: { partPresent: true } } } });
  cellId = (await createCell({ ownerId: trainer.id, name: 'PLC link bench', origin: 'template', document, message: 'plc link test' })).id;
});

afterAll(async () => {
  client?.close(() => {});
  await stopAllSessions();
  await closeDb();
});

describe('PLC link', () => {
  it('starts a session on the chosen port and serves the register map generated from the document', async () => {
    const r = await call(links.POST, '/api/plc-links', { method: 'POST', cookie: trainerCookie, body: { cellId, port: PORT, linkTimeoutMs: TIMEOUT_MS } });
    expect(r.status).toBe(201);
    session = (r.body as { session: PlcLinkView }).session;
    expect(session).toMatchObject({ status: 'running', port: PORT, host: '127.0.0.1', linkTimeoutMs: TIMEOUT_MS });
    expect(session.runId).toBeTruthy();

    const csv = await call(mapRoute.GET, `/api/plc-links/${session.id}/register-map`, { cookie: trainerCookie, params: { id: session.id } });
    expect(csv.status).toBe(200);
    const lines = (csv.body as string).trim().split('\r\n');
    expect(lines[0]).toBe('table,offset,address,label,direction');
    const rows = registerMap(document);
    expect(lines).toHaveLength(rows.length + 1);
    // The document's PLC modules: %IX0.0–%IX1.7 (16 channels), %QX0.0–%QX1.7 and %QX2.x, which
    // %QW2 (bytes 2–3) covers, so the word is holding register 0 and those bits are not coils.
    const byAddress = Object.fromEntries(rows.map((x) => [x.address, x]));
    expect(byAddress['%QX0.0']).toMatchObject({ table: 'coil', offset: 0, direction: 'plc-writes' });
    expect(byAddress['%QX1.7']).toMatchObject({ table: 'coil', offset: 15 });
    expect(byAddress['%QX2.0']).toBeUndefined();
    expect(byAddress['%IX0.0']).toMatchObject({ table: 'discrete-input', offset: 0, direction: 'plc-reads' });
    expect(byAddress['%IX1.5']).toMatchObject({ table: 'discrete-input', offset: 13 });
    expect(byAddress['%QW2']).toMatchObject({ table: 'holding-register', offset: 0, direction: 'plc-writes' });
    expect(rows.filter((x) => x.table === 'coil')).toHaveLength(16);
    expect(rows.filter((x) => x.table === 'discrete-input')).toHaveLength(16);
    expect(lines).toContain('coil,0,%QX0.0,controller rack 1 slot 2 channel 0; sheet robotStart,plc-writes');
    expect(rows).toEqual(registerMap(cellDocumentSchema.parse(pickAndPlaceCell)));
  });

  it('a second session on the same port is refused with 409 naming the session that holds it; the per-user cap too', async () => {
    const leadCell = (await createCell({ ownerId: lead.id, name: 'Lead bench', origin: 'template', document, message: 'lead' })).id;
    const r = await call(links.POST, '/api/plc-links', { method: 'POST', cookie: leadCookie, body: { cellId: leadCell, port: PORT } });
    expect(r.status).toBe(409);
    expect(r.body).toMatchObject({ sessionId: session.id });
    expect((r.body as { error: string }).error).toContain(session.id);
    const again = await call(links.POST, '/api/plc-links', { method: 'POST', cookie: trainerCookie, body: { cellId, port: OTHER_PORT } });
    expect(again.status).toBe(409);
    expect(again.body).toMatchObject({ sessionId: session.id });
    const students = await call(links.POST, '/api/plc-links', { method: 'POST', cookie: await sessionCookie(await makeUser('student')), body: { cellId, port: OTHER_PORT } });
    expect(students.status).toBe(403);
  });

  it('a Modbus client drives a full handshake cycle of the demo cell', { timeout: 30_000 }, async () => {
    client = new ModbusRTU();
    await client.connectTCP('127.0.0.1', { port: PORT });
    client.setID(1);
    client.setTimeout(2000);

    // Inputs the PLC reads: e-stop chain healthy (%IX0.2), guard closed (%IX0.4), part (%IX0.5).
    const inputs = await client.readDiscreteInputs(0, 16);
    expect(inputs.data.slice(0, 8)).toEqual([false, true, true, false, true, true, false, false]);
    // What the demo's sheet would write: guard pass-through, part pass-through, no stop, recipe 1.
    await client.writeCoils(0, [false, false, false, true, false, true, false, false]);
    // A PLC rewrites every output each scan: the same values again change nothing.
    await client.writeCoils(0, [false, false, false, true, false, true, false, false]);
    await client.writeRegisters(0, [1]);
    expect((await client.readHoldingRegisters(0, 1)).data).toEqual([1]);
    // The controller boots (bootMs 1500) and reports ready (%IX1.0 = discrete input 8).
    await waitForInput(8, true, 5000);
    expect((await client.readDiscreteInputs(9, 1)).data[0]).toBe(true); // at home

    // The PLC sets robot start (FC 05), the controller answers cycling (%IX1.2); start drops.
    await client.writeCoil(0, true);
    await waitForInput(10, true, 2000);
    await client.writeCoil(0, false);
    await client.writeCoil(10, true); // green stack light while cycling, as the sheet does
    // Cycle done (%IX1.5), then back at home and not cycling.
    await waitForInput(13, true, 20_000);
    await waitForInput(10, false, 2000);
    await client.writeCoil(10, false);
    expect((await client.readDiscreteInputs(8, 2)).data.slice(0, 2)).toEqual([true, true]);

    const coils = await client.readCoils(0, 16);
    expect(coils.data.slice(0, 8)).toEqual([false, false, false, true, false, true, false, false]);
    // An address past the map: exception 02, ILLEGAL DATA ADDRESS.
    await expect(client.readCoils(16, 1)).rejects.toMatchObject({ modbusCode: 2 });

    await sleep(300); // one state report
    const v = await view(session.id);
    expect(v.status).toBe('running');
    expect(v.health).toMatchObject({ linked: true, lost: false });
    expect(v.health!.requests).toBeGreaterThan(20);
    expect(v.health!.requestsPerSecond).toBeGreaterThan(5);
    expect(v.health!.updatePeriodMs).not.toBeNull();
    expect(v.snapshot!.controller.cyclesCompleted).toBe(1);
    expect(v.snapshot!.plc.addresses['%QX0.3']).toMatchObject({ value: 1 });

    // Health counts Modbus requests, not the addresses they name: five reads of 16 inputs are five.
    for (let i = 0; i < 5; i++) await client.readDiscreteInputs(0, 16);
    await sleep(300);
    const after = await view(session.id);
    expect(after.health!.requests - v.health!.requests).toBe(5);
  });

  it('a silent PLC is a lost link after the timeout: the coils drop and the session says so; requests recover it', { timeout: 15_000 }, async () => {
    await sleep(TIMEOUT_MS + 600);
    const lost = await view(session.id);
    expect(lost.health).toMatchObject({ linked: false, lost: true });
    expect(lost.health!.lastRequestAgeMs).toBeGreaterThan(TIMEOUT_MS);
    expect(lost.snapshot!.plc.addresses['%QX0.3']).toMatchObject({ value: 0 });
    expect(lost.snapshot!.plc.addresses['%QW2']).toMatchObject({ value: 0 });

    const coils = await client.readCoils(0, 16);
    expect(coils.data.slice(0, 16).every((c) => c === false)).toBe(true);
    await client.writeCoil(3, true);
    await sleep(300);
    const back = await view(session.id);
    expect(back.health).toMatchObject({ linked: true, lost: false });
    expect(back.snapshot!.plc.addresses['%QX0.3']).toMatchObject({ value: 1 });
  });

  it('stops on request; the PLC writes are stored as a run that replays to the same cycle', { timeout: 15_000 }, async () => {
    const r = await call(link.DELETE, `/api/plc-links/${session.id}`, { method: 'DELETE', cookie: trainerCookie, params: { id: session.id } });
    expect(r.status).toBe(200);
    expect((r.body as { session: PlcLinkView }).session).toMatchObject({ status: 'stopped' });
    await expect(client.readCoils(0, 1)).rejects.toBeTruthy();

    const run = await findRun(session.runId!);
    expect(run).toMatchObject({ cellId, userId: trainer.id });
    const batches = await listBatches(session.runId!);
    const events = batches.flatMap((b) => b.events);
    expect(events[0].event).toMatchObject({ type: 'download' });
    expect(events.some((e) => e.event.type === 'force' && e.event.target === '%QX0.0' && e.event.value === 1)).toBe(true);
    // Only changes are logged: forced to 0 at the start, the PLC's 1 (written twice), 0 at the
    // link loss, the PLC's 1 again after it.
    const guardForces = events.filter((e) => e.event.type === 'force' && e.event.target === '%QX0.3').map((e) => (e.event as { value: number }).value);
    expect(guardForces).toEqual([0, 1, 0, 1]);
    const replayed = replay(document, events, { untilMs: batches[batches.length - 1].untilMs });
    expect(replayed.ok).toBe(true);
    if (replayed.ok) expect(replayed.value.snapshot.controller.cyclesCompleted).toBe(1);

    const gone = await call(link.GET, `/api/plc-links/${session.id}`, { cookie: leadCookie, params: { id: session.id } });
    expect(gone.status).toBe(404);
  });

  it('stops when its owner signs out (session generation moves on) and when nobody views it for the idle timeout', { timeout: 15_000 }, async () => {
    const owner = await makeUser('trainer');
    const ownCell = (await createCell({ ownerId: owner.id, name: 'Sign-out bench', origin: 'template', document, message: 'x' })).id;
    const a = await startSession(owner, { cellId: ownCell, port: OTHER_PORT, linkTimeoutMs: 1000 });
    await db()('users').where({ id: owner.id }).increment('session_generation', 1);
    await watchNow();
    expect(sessionsOf(owner).find((x) => x.id === a.id)).toMatchObject({ status: 'stopped', stopReason: 'stopped: its owner signed out' });
    const other = await makeUser('lead');
    const b = await startSession(other, { cellId: (await createCell({ ownerId: other.id, name: 'Idle bench', origin: 'template', document, message: 'x' })).id, port: OTHER_PORT, linkTimeoutMs: 1000 });
    expect(b.status).toBe('running'); // the port was freed by the signed-out owner's session
    process.env.PLC_LINK_IDLE_MINUTES = '0.05';
    try {
      await sleep(3200);
      await watchNow();
    } finally {
      delete process.env.PLC_LINK_IDLE_MINUTES;
    }
    const after = await call(links.GET, '/api/plc-links', { cookie: await sessionCookie(other) });
    const mine = (after.body as { sessions: { id: string; status: string; stopReason: string }[] }).sessions;
    expect(mine.find((x) => x.id === b.id)).toMatchObject({ status: 'stopped' });
    expect(mine.find((x) => x.id === b.id)!.stopReason).toContain('idle');
    expect(a.id).not.toBe(b.id);
  });
});
