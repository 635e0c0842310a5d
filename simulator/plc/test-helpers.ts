/**
 * Test helpers: build one-block sheets whose BOOL inputs come from %IX bits and run the
 * compiled sheet and the reference interpreter side by side. Used only by *.test.ts.
 */
import { createProcessImage, setBit, type ProcessImage } from '@/simulator/address/process-image';
import type { BlockOutputs, LogicSheetInput } from './api';
import { blockPorts, type BlockType } from './catalogue';
import { compileSheet } from './compile';
import { interpretSheet } from './interpret';

/** Input port → %IX0.k bit index, for the BOOL inputs of the block under test. */
export type Harness = {
  /** Runs one scan with the given BOOL inputs (by port name) and returns the block's outputs. */
  step(inputs: Record<string, boolean>, dtMs?: number): Record<string, boolean | number>;
  image: ProcessImage;
};

/** Wraps one block; each BOOL input is fed by an NO contact on %IX0.k. */
export function harness(type: BlockType, params: Record<string, unknown> = {}, scanPeriodMs = 10): Harness {
  const boolInputs = blockPorts(type, params).inputs.filter((p) => p.type === 'BOOL');
  const sheet: LogicSheetInput = {
    scanPeriodMs,
    blocks: [
      ...boolInputs.map((p, k) => ({ id: `in_${p.name}`, type: 'NO_CONTACT' as const, params: { address: `%IX0.${k}` }, position: { x: 0, y: k } })),
      { id: 'dut', type, params, position: { x: 1, y: 0 } } as LogicSheetInput['blocks'][number],
    ],
    connections: boolInputs.map((p) => ({ id: `w_${p.name}`, from: { block: `in_${p.name}`, port: 'Q' }, to: { block: 'dut', port: p.name } })),
  };
  const c = compileSheet(sheet);
  const r = interpretSheet(sheet);
  if (!c.ok || !r.ok) throw new Error(`bad test sheet: ${JSON.stringify(c.ok ? [] : c.errors)}`);
  const compiled = c.value;
  const ref = r.value;
  const state = compiled.createState();
  const image = createProcessImage();
  const refImage = createProcessImage();
  return {
    image,
    step(inputs, dtMs = scanPeriodMs) {
      boolInputs.forEach((p, k) => {
        setBit(image, 'I', 0, k, inputs[p.name] ?? false);
        setBit(refImage, 'I', 0, k, inputs[p.name] ?? false);
      });
      compiled.scan(state, image, dtMs);
      ref.scan(refImage, dtMs);
      const a: BlockOutputs = compiled.readBlockOutputs(state);
      const b: BlockOutputs = ref.readBlockOutputs();
      // Every step doubles as a compiled ≡ interpreted check.
      if (JSON.stringify(a.dut) !== JSON.stringify(sortKeys(b.dut, a.dut))) {
        throw new Error(`compiled ${JSON.stringify(a.dut)} differs from reference ${JSON.stringify(b.dut)}`);
      }
      return a.dut ?? {};
    },
  };
}

function sortKeys(x: Record<string, unknown> | undefined, like: Record<string, unknown> | undefined) {
  if (!x || !like) return x;
  return Object.fromEntries(Object.keys(like).map((k) => [k, x[k]]));
}
