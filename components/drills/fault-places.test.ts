import { describe, expect, it } from 'vitest';
import { cellDocumentSchema, pickAndPlaceCell } from '@/simulator';
import { allPlaces, devicePlaces, formatAnswer, modulePlaces, parseAnswer, wirePlaces } from './fault-places';
import { locationKey } from '@/lib/runs/grade';

const doc = cellDocumentSchema.parse(structuredClone(pickAndPlaceCell));

describe('fault card places', () => {
  it('offers only the devices a fault kind applies to (the engine refuses the others)', () => {
    expect(devicePlaces(doc, 'sensor-type-mismatch').map((p) => p.id)).toEqual(['part']);
    expect(devicePlaces(doc, 'slow-actuator').map((p) => p.id)).toEqual(['gripper']);
    expect(devicePlaces(doc, 'stuck-on').map((p) => p.id)).toEqual(expect.arrayContaining(['start', 'estop', 'guard', 'part', 'gripper']));
    expect(devicePlaces(doc, 'stuck-on').map((p) => p.id)).not.toContain('readyLamp');
  });

  it('names wires by what they join and modules by where they sit', () => {
    expect(wirePlaces(doc).find((w) => w.id === 'w-guard')?.label).toBe('w-guard — Front guard (guard:contact) → %IX0.4');
    expect(modulePlaces(doc).map((m) => m.id)).toEqual(['plc-di0', 'plc-dq0', 'plc-dq2', 'ctl-di', 'ctl-do', 'ctl-to', 'ctl-ti']);
    expect(allPlaces(doc).some((p) => p.id === 'pm-di')).toBe(true);
  });

  it('reads and writes the grader’s answer form (alternatives with |, pairs with commas)', () => {
    expect(parseAnswer('part|w-part')).toEqual([['part'], ['w-part']]);
    expect(parseAnswer('w-start,w-reset')).toEqual([['w-start', 'w-reset']]);
    expect(parseAnswer('')).toEqual([]);
    for (const text of ['part|w-part', 'w-start,w-reset', 'airPressure|w-air', 'pm-di']) {
      expect(locationKey(formatAnswer(parseAnswer(text)))).toBe(locationKey(text));
      expect(formatAnswer(parseAnswer(text))).toBe(text);
    }
    expect(formatAnswer([['w-a', ''], [], ['x']])).toBe('w-a|x');
  });
});
