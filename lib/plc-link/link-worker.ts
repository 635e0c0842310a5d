/**
 * One PLC-link session's worker thread: the cell, running in real time (×1), and the Modbus
 * TCP server a real PLC talks to. Loaded by path (bundled by lib/workers/bundle.ts),
 * never imported by the app.
 *
 * How a real PLC replaces the logic sheet, with the engine's public events only (so the run's
 * event log replays exactly on the stored cell version):
 * 1. at t = 0 a `download` of an empty logic sheet (same scan period) takes the sheet out;
 * 2. at t = 0 every output address of the register map is forced to 0;
 * 3. each coil or holding-register write from the PLC that changes the value in effect becomes a
 *    `force` of that address, at the cell time it arrived. A PLC rewrites every output on every
 *    scan; repeating an unchanged value would add nothing to the trace, so the event log grows
 *    with the changes only (and each request costs one map lookup per unchanged address).
 *    The snapshot marks these addresses as forced.
 * A silent PLC (no request for `linkTimeoutMs`) is a lost link: every coil and holding
 * register is forced to 0 — de-energised outputs, the safe state — until requests resume and
 * the PLC writes again.
 */
import { parentPort, workerData } from 'node:worker_threads';
import type { EventEmitter } from 'node:events';
import { performance } from 'node:perf_hooks';
import { ServerTCP } from 'modbus-serial';
import { createCell, type Cell } from '@/simulator';
import { registerMap, tablesOf } from './register-map';
import type { HostMessage, LinkHealth, LinkWorkerData, WorkerMessage } from './protocol';

const data = workerData as LinkWorkerData;
const post = (m: WorkerMessage) => parentPort!.postMessage(m);

// MODBUS Application Protocol Specification V1.1b3, §7 "MODBUS Exception Responses":
// 02 ILLEGAL DATA ADDRESS, 03 ILLEGAL DATA VALUE.
const illegalAddress = () => Object.assign(new Error('illegal data address'), { modbusErrorCode: 0x02 });

function start(): void {
  const made = createCell(data.document, {});
  if (!made.ok) {
    post({ type: 'failed', code: 'invalid_cell', message: made.errors.map((p) => p.message).join('; ') });
    return;
  }
  const cell: Cell = made.value;
  const doc = data.document as { plc: { sheet: { scanPeriodMs: number } } };
  const must = (r: { ok: boolean; errors?: { message: string }[] }) => {
    if (!r.ok) throw new Error(r.errors?.map((p) => p.message).join('; '));
  };
  must(cell.apply({ type: 'download', logic: { blocks: [], connections: [], scanPeriodMs: doc.plc.sheet.scanPeriodMs } }));
  const map = registerMap(data.document as never);
  const tables = tablesOf(map);
  const outputs = [...tables.coil, ...tables['holding-register']];
  // The value each output address is forced to now (the PLC's write, or 0 while the link is lost).
  const inEffect = new Map<string, number>();
  const forceAll = (value: number) => {
    for (const a of outputs) {
      must(cell.apply({ type: 'force', target: a, value }));
      inEffect.set(a, value);
    }
  };
  forceAll(0);

  const t0 = performance.now();
  // Cell time follows the wall clock in whole ms; one request reading many addresses catches up once.
  const catchUp = () => {
    const target = Math.floor(performance.now() - t0);
    const now = cell.timeMs;
    if (target > now) must(cell.advance(target - now));
  };

  let requests = 0;
  let lastRequestAt: number | null = null;
  const recent: number[] = [];
  const writeTimes: number[] = [];
  let lost = false;
  // modbus-serial calls the vector once per address: a request for 16 inputs is 16 calls, all
  // in the same turn of the event loop. A request is counted once, at its first call.
  let inRequest = false;
  const seen = () => {
    const at = performance.now();
    lastRequestAt = at;
    if (lost) lost = false;
    if (inRequest) return;
    inRequest = true;
    queueMicrotask(() => {
      inRequest = false;
    });
    requests++;
    recent.push(at);
  };
  const wrote = () => {
    const at = performance.now();
    // One FC15/FC16 request writes several addresses within the same tick: one update.
    if (writeTimes.length === 0 || at - writeTimes[writeTimes.length - 1] > 1) writeTimes.push(at);
    if (writeTimes.length > 21) writeTimes.shift();
  };
  const read = (address: string | undefined): number => {
    if (address === undefined) throw illegalAddress();
    const r = cell.readSignal(`plc.${address}`);
    return r.ok ? Number(r.value) : 0;
  };
  const write = (address: string | undefined, value: number) => {
    if (address === undefined) throw illegalAddress();
    if (inEffect.get(address) === value) return;
    catchUp();
    must(cell.apply({ type: 'force', target: address, value }));
    inEffect.set(address, value);
  };

  const vector = {
    getCoil: (addr: number) => { seen(); catchUp(); return read(tables.coil[addr]) !== 0; },
    getDiscreteInput: (addr: number) => { seen(); catchUp(); return read(tables['discrete-input'][addr]) !== 0; },
    getHoldingRegister: (addr: number) => { seen(); catchUp(); return read(tables['holding-register'][addr]) & 0xffff; },
    getInputRegister: (addr: number) => { seen(); catchUp(); return read(tables['input-register'][addr]) & 0xffff; },
    setCoil: (addr: number, value: boolean) => { seen(); wrote(); write(tables.coil[addr], value ? 1 : 0); },
    setRegister: (addr: number, value: number) => { seen(); wrote(); write(tables['holding-register'][addr], value & 0xffff); },
  };

  const server = new ServerTCP(vector, { host: data.host, port: data.port, unitID: 255 });
  // modbus-serial's typings declare only 'initialized'; the server emits these too (servers/servertcp.js).
  const events = server as unknown as EventEmitter;
  events.on('serverError', (e: NodeJS.ErrnoException) => {
    post({ type: 'failed', code: e.code ?? 'server_error', message: e.message });
    shutdown(false);
  });
  events.on('initialized', () => post({ type: 'listening', host: data.host, port: data.port }));
  events.on('socketError', () => { /* a PLC dropping its connection is link health, not a crash */ });
  events.on('error', () => { /* per-socket errors: the client reconnects */ });

  const health = (): LinkHealth => {
    const at = performance.now();
    while (recent.length && at - recent[0] > 1000) recent.shift();
    const gaps = writeTimes.slice(1).map((t, i) => t - writeTimes[i]).sort((a, b) => a - b);
    const age = lastRequestAt === null ? null : Math.round(at - lastRequestAt);
    return {
      linked: age !== null && age <= data.linkTimeoutMs,
      lost,
      requests,
      lastRequestAgeMs: age,
      requestsPerSecond: recent.length,
      updatePeriodMs: gaps.length ? Math.round(gaps[Math.floor(gaps.length / 2)] * 10) / 10 : null,
      linkTimeoutMs: data.linkTimeoutMs,
    };
  };

  let reported = 0;
  const tick = setInterval(() => {
    catchUp();
    if (!lost && lastRequestAt !== null && performance.now() - lastRequestAt > data.linkTimeoutMs) {
      lost = true;
      forceAll(0);
    }
  }, 5);
  const report = setInterval(() => {
    const log = cell.eventLog(reported);
    reported += log.length;
    post({ type: 'state', snapshot: cell.snapshot(), health: health(), events: log, timeMs: cell.timeMs });
  }, data.reportEveryMs ?? 100);

  let done = false;
  function shutdown(final: boolean) {
    if (done) return;
    done = true;
    clearInterval(tick);
    clearInterval(report);
    const finish = () => {
      if (final) {
        catchUp();
        post({ type: 'stopped', events: cell.eventLog(reported), timeMs: cell.timeMs });
      }
      cell.dispose();
      parentPort!.close();
    };
    try {
      server.close(() => finish());
    } catch {
      finish();
    }
  }
  parentPort!.on('message', (m: HostMessage) => {
    if (m.type === 'stop') shutdown(true);
  });
}

start();
