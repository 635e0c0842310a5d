import { describe, expect, it } from 'vitest';
import { createCell, pickAndPlaceCell, type FaultCard } from '@/simulator';
import { sanitiseEvents, sanitiseSnapshot, sanitiseTrace } from './sanitise';

const hidden: FaultCard[] = [
  { id: 'secretBreak', kind: 'open-wire', row: 'w-stop', label: 'SECRET-LABEL-1' },
  { id: 'secretSwap', kind: 'swapped-wires', rows: ['w-start', 'w-reset'], at: 10 },
];

describe('sanitiseSnapshot', () => {
  it('keeps symptoms and drops every trace of the fault cards', () => {
    const made = createCell(pickAndPlaceCell, { faults: hidden });
    if (!made.ok) throw new Error('cell');
    made.value.advance(500);
    const raw = made.value.snapshot();
    // The engine's own snapshot names the cards (so the check below is meaningful).
    expect(JSON.stringify(raw)).toContain('secretBreak');
    const clean = sanitiseSnapshot(raw);
    const text = JSON.stringify(clean);
    for (const needle of ['secretBreak', 'secretSwap', 'SECRET-LABEL-1', 'open-wire', 'swapped-wires', '"faults"']) expect(text).not.toContain(needle);
    // Symptom: the NC stop input reads off with the wire broken (common practice: a broken NC circuit reads as stop).
    expect(clean.wires.find((w) => w.id === 'w-stop')!.reading).toBe('off');
    expect(clean.controller.state).toBe(raw.controller.state);
    expect(clean.devices).toEqual(raw.devices);
    made.value.dispose();
  });
});

describe('sanitiseTrace and sanitiseEvents', () => {
  it('removes fault.<card> signals and renumbers the rest', () => {
    const t = sanitiseTrace({ signals: ['a', 'fault.x', 'b'], samples: [[0, 0, 1], [0, 1, 1], [5, 2, 3]], endMs: 9 });
    expect(t).toEqual({ signals: ['a', 'b'], samples: [[0, 0, 1], [5, 1, 3]], endMs: 9 });
  });
  it('removes fault card events', () => {
    const out = sanitiseEvents([
      { t: 1, event: { type: 'press', device: 'start' } },
      { t: 2, event: { type: 'inject-fault', fault: hidden[0] } },
      { t: 3, event: { type: 'clear-fault', id: 'secretBreak' } },
    ]);
    expect(out).toEqual([{ t: 1, event: { type: 'press', device: 'start' } }]);
  });
});
