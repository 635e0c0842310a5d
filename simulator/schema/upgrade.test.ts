import { describe, expect, it } from 'vitest';
import { pickAndPlaceCell } from '@/simulator/demo';
import { replay } from '@/simulator/trace/replay';
import { signalNamesOf } from '@/simulator/cell/signal-names';
import { CELL_SCHEMA_VERSION } from './cell-document';
import { upgradeCellDocument } from './upgrade';
import { validateCellDocument } from './validate';

type Json = Record<string, unknown>;

/** The demo cell as schema version 1 wrote it: the recipe word under the handshake role `job`. */
function versionOne(): Json {
  const doc = structuredClone(pickAndPlaceCell) as unknown as Json & { controller: { handshake: { inputs: Json } } };
  const { recipe, ...inputs } = doc.controller.handshake.inputs;
  doc.controller.handshake.inputs = { ...inputs, job: recipe };
  return { ...doc, schemaVersion: 1 };
}

const LOG = [
  { t: 1000, event: { type: 'set-selector', device: 'recipe', position: 1 } },
  { t: 2000, event: { type: 'set-field', device: 'part', active: true } },
  { t: 2100, event: { type: 'press', device: 'start' } },
  { t: 2160, event: { type: 'release', device: 'start' } },
];

describe('upgradeCellDocument', () => {
  it('is at version 2, where the handshake role `job` is called `recipe`', () => {
    expect(CELL_SCHEMA_VERSION).toBe(2);
  });

  it('maps a version-1 document\'s `job` role to `recipe` and nothing else, leaving its input untouched', () => {
    const old = versionOne();
    const before = structuredClone(old);
    const up = upgradeCellDocument(old) as Json & { controller: { handshake: { inputs: Json } } };
    expect(old).toEqual(before);
    expect(up.schemaVersion).toBe(2);
    expect(up.controller.handshake.inputs.recipe).toBe('WI1');
    expect(up.controller.handshake.inputs).not.toHaveProperty('job');
    expect(up).toEqual(JSON.parse(JSON.stringify(pickAndPlaceCell)));
  });

  it('returns current documents, other versions and non-objects as they are', () => {
    const current = structuredClone(pickAndPlaceCell);
    expect(upgradeCellDocument(current)).toBe(current);
    const future = { ...versionOne(), schemaVersion: 99 };
    expect(upgradeCellDocument(future)).toBe(future);
    expect(upgradeCellDocument(null)).toBeNull();
    expect(upgradeCellDocument([1])).toEqual([1]);
    const noController = { schemaVersion: 1, id: 'x' };
    expect(upgradeCellDocument(noController)).toEqual({ schemaVersion: 2, id: 'x' });
  });

  it('lets a version-1 document validate, and a version it does not know is still refused at schemaVersion', () => {
    const v = validateCellDocument(versionOne());
    expect(v.ok && v.value.document.controller.handshake.inputs.recipe).toBe('WI1');
    const bad = validateCellDocument({ ...versionOne(), schemaVersion: 0 });
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.errors.map((p) => p.path.join('.'))).toContain('schemaVersion');
  });

  it('gives the same signal names and the same trace hash before and after (stored run hashes stay verifiable)', () => {
    const names = signalNamesOf(pickAndPlaceCell);
    if (!names.ok) throw new Error(JSON.stringify(names.errors));
    expect(signalNamesOf(versionOne())).toEqual(names);
    const a = replay(versionOne(), LOG, { trace: names.value, untilMs: 20_000 });
    const b = replay(pickAndPlaceCell, LOG, { trace: names.value, untilMs: 20_000 });
    if (!a.ok || !b.ok) throw new Error(JSON.stringify([a, b]));
    expect(a.value.hash).toBe(b.value.hash);
    // The recipe selector reached the controller: WI1 read 2 during the run.
    const wi1 = names.value.indexOf('ctl.WI1');
    expect(a.value.trace.samples.some(([, i, v]) => i === wi1 && v === 2)).toBe(true);
  });
});
