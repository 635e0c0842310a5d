import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { pickAndPlaceCell, starterCell, demoCells } from './index';
import { checkRules, replay, rulesSchema, validateCellDocument } from '@/simulator/index';

const example = (name: string): unknown => JSON.parse(readFileSync(fileURLToPath(new URL(`./examples/${name}`, import.meta.url)), 'utf8'));

describe('demo cells', () => {
  it('the JSON examples for the headless runner are the shipped demo documents', () => {
    expect(example('pick-and-place.cell.json')).toEqual(JSON.parse(JSON.stringify(pickAndPlaceCell)));
    expect(example('starter.cell.json')).toEqual(JSON.parse(JSON.stringify(starterCell)));
    expect(Object.keys(demoCells).sort()).toEqual(['kestrel-vale-cell-b', 'kestrel-vale-starter']);
  });

  it('the pick-and-place demo has what the brief asks for', () => {
    const v = validateCellDocument(pickAndPlaceCell);
    if (!v.ok) throw new Error(JSON.stringify(v.errors));
    const d = v.value.document;
    const panel = Object.fromEntries(d.panel.map((x) => [x.id, x]));
    expect(panel.start).toMatchObject({ type: 'push-button', contact: 'NO', colour: 'green' }); // IEC 60204-1 §10.2: green start
    expect(panel.stop).toMatchObject({ type: 'push-button', contact: 'NC', colour: 'red' });
    expect(panel.estop).toMatchObject({ type: 'e-stop', colour: 'red' });
    expect(d.panel.some((x) => x.type === 'stack-light')).toBe(true);
    expect(d.field.map((x) => x.type).sort()).toEqual(['gripper', 'guard-switch', 'part-sensor']);
    expect(d.controller.routine.length).toBeGreaterThanOrEqual(4);
    expect(d.controller.handshake.inputs.recipe).toBe('WI1');
    expect(v.value.plans.length).toBe(d.wiring.length);
  });

  it('the example run passes its example rules', () => {
    const rules = rulesSchema.parse(example('pick-and-place.rules.json'));
    const r = replay(pickAndPlaceCell, example('pick-and-place.events.json'), {
      trace: ['plc.%IX0.4', 'arm.moving', 'ctl.state', 'dev.estop.latched', 'ctl.servo', 'ctl.cycles'],
      untilMs: 30_000,
    });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const checked = checkRules(r.value.trace, rules);
    if (!checked.ok) throw new Error(JSON.stringify(checked.errors));
    expect(checked.value.map((x) => x.status)).toEqual(['pass', 'pass', 'pass', 'pass']);
    // One cycle: held by the guard at 4 s, e-stopped at 9 s, resumed after reset and start at 11 s.
    expect(r.value.snapshot.controller.cyclesCompleted).toBe(1);
  });
});
