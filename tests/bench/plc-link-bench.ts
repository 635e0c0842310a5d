/**
 * `modbus_roundtrip_p99_ms` (issue 13): a Modbus TCP client polling the PLC-link cell every
 * 10 ms on loopback, each cycle reading the discrete inputs (FC 02) and writing the coils
 * (FC 15), as a PLC scan would. The worker thread is the one a session runs (the pick-and-place
 * demo in real time, its ServerTCP); the client is modbus-serial's, in this process. Reported:
 * per-request round trip (p50, p99, target p99 ≤ 5 ms) and per-cycle (read + write) p99.
 */
import { Worker } from 'node:worker_threads';
import { pathToFileURL } from 'node:url';
import ModbusRTU from 'modbus-serial';
import { pickAndPlaceCell } from '@/simulator';
import { buildBundle, PLC_LINK_WORKER } from '@/lib/workers/bundle';
import type { LinkWorkerData, WorkerMessage } from '@/lib/plc-link/protocol';

const PORT = Number(process.env.BENCH_MODBUS_PORT ?? 15039);
const CYCLES = 1000;

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
}

export async function plcLinkBench(): Promise<Record<string, number>> {
  const data: LinkWorkerData = { sessionId: 'bench', document: pickAndPlaceCell, host: '127.0.0.1', port: PORT, linkTimeoutMs: 1000 };
  const worker = new Worker(pathToFileURL(buildBundle(PLC_LINK_WORKER)), { workerData: data });
  await new Promise<void>((resolve, reject) => {
    worker.on('message', (m: WorkerMessage) => {
      if (m.type === 'listening') resolve();
      if (m.type === 'failed') reject(new Error(m.message));
    });
    worker.once('error', reject);
  });
  const client = new ModbusRTU();
  await client.connectTCP('127.0.0.1', { port: PORT });
  client.setID(1);
  const requests: number[] = [];
  const cycles: number[] = [];
  const coils = [false, false, false, true, false, true, false, false];
  for (let i = 0; i < CYCLES + 50; i++) {
    const t0 = performance.now();
    await client.readDiscreteInputs(0, 16);
    const t1 = performance.now();
    coils[0] = i % 2 === 0;
    await client.writeCoils(0, coils);
    const t2 = performance.now();
    if (i >= 50) {
      requests.push(t1 - t0, t2 - t1);
      cycles.push(t2 - t0);
    }
    await new Promise((r) => setTimeout(r, Math.max(0, 10 - (performance.now() - t0))));
  }
  await new Promise<void>((r) => client.close(() => r()));
  const exited = new Promise((r) => worker.once('exit', r));
  worker.postMessage({ type: 'stop' });
  await exited;
  requests.sort((a, b) => a - b);
  cycles.sort((a, b) => a - b);
  const r2 = (x: number) => Math.round(x * 100) / 100;
  return {
    modbus_roundtrip_p50_ms: r2(percentile(requests, 50)),
    modbus_roundtrip_p99_ms: r2(percentile(requests, 99)),
    modbus_cycle_p99_ms: r2(percentile(cycles, 99)),
  };
}

// `npx tsx tests/bench/plc-link-bench.ts` runs it alone.
if (process.argv[1]?.endsWith('plc-link-bench.ts')) {
  plcLinkBench().then((f) => console.log(JSON.stringify(f)), (err) => {
    console.error(err);
    process.exit(1);
  });
}
