/**
 * The rule model: what the schema accepts and refuses (with paths and codes), the plain
 * English rendering, and labels taken from a cell document.
 */
import { describe, expect, it } from 'vitest';
import { pickAndPlaceCell, starterCell } from '@/simulator/demo';
import { describeRule, interlockRuleSchema, interlockRulesSchema, ruleAddresses, signalLabels, MAX_CONDITION_DEPTH, type RuleCondition } from './rules';

const codes = (r: { success: boolean; error?: { issues: { path: PropertyKey[]; params?: unknown; code: string }[] } }) =>
  (r.error?.issues ?? []).map((i) => [(i.params as { code?: string } | undefined)?.code ?? i.code, i.path.join('.')]);

describe('interlock rule schema', () => {
  it('accepts the three kinds, nested conditions, and fills the within trigger', () => {
    const parsed = interlockRulesSchema.parse([
      { id: 'g1', title: 'Guard', kind: 'never', what: { signal: '%QX0.1', value: 'on' }, while: { signal: '%IX0.2', value: 'off' } },
      { id: 'g2', title: '', kind: 'only-if', what: { signal: '%QX0.1', value: 'on' }, requires: [{ all: [{ signal: '%IX0.2', value: 'on' }, { not: { signal: '%MX1.7', value: 'on' } }] }] },
      { id: 'g3', title: '', kind: 'within', after: { any: [{ signal: '%IX0.1', value: 'off' }] }, expect: { signal: '%QX0.1', value: 'off' }, scans: 2 },
    ]);
    expect(parsed[2]).toMatchObject({ kind: 'within', trigger: 'rises' });
  });
  it('refuses words, bad addresses, empty lists, unknown keys, duplicate ids and deep nesting, with paths', () => {
    expect(codes(interlockRuleSchema.safeParse({ id: 'a', title: '', kind: 'never', what: { signal: '%QW0', value: 'on' }, while: { signal: '%IX0.9', value: 'on' } }))).toEqual([
      ['address_size', 'what.signal'],
      ['address_range', 'while.signal'],
    ]);
    expect(codes(interlockRuleSchema.safeParse({ id: 'a', title: '', kind: 'only-if', what: { signal: '%QX0.0', value: 'on' }, requires: [] }))).toEqual([['too_small', 'requires']]);
    expect(interlockRuleSchema.safeParse({ id: 'a', title: '', kind: 'within', after: { signal: '%IX0.0', value: 'on' }, expect: { signal: '%QX0.0', value: 'on' }, scans: -1 }).success).toBe(false);
    expect(interlockRuleSchema.safeParse({ id: 'a', title: '', kind: 'never', what: { signal: '%QX0.0', value: 'on', extra: 1 }, while: { signal: '%IX0.0', value: 'on' } }).success).toBe(false);
    const rule = { id: 'a', title: '', kind: 'never', what: { signal: '%QX0.0', value: 'on' }, while: { signal: '%IX0.0', value: 'on' } };
    expect(codes(interlockRulesSchema.safeParse([rule, rule]))).toEqual([['duplicate_id', '1.id']]);
    let deep: RuleCondition = { signal: '%IX0.0', value: 'on' };
    for (let i = 0; i < MAX_CONDITION_DEPTH; i++) deep = { not: deep };
    expect(codes(interlockRuleSchema.safeParse({ ...rule, while: deep }))).toEqual([['too_deep', 'while']]);
  });
  it('lists a rule\'s signals once each, in canonical form', () => {
    expect(ruleAddresses({ id: 'a', title: '', kind: 'never', what: { signal: '%q0.1', value: 'on' }, while: { any: [{ signal: '%IX0.2', value: 'off' }, { signal: '%QX0.1', value: 'off' }] } })).toEqual(['%QX0.1', '%IX0.2']);
  });
});

describe('plain English', () => {
  const labels = { '%QX0.1': 'Robot start', '%IX0.2': 'Guard closed', '%IX0.3': 'E-stop healthy', '%IX0.0': 'Start' };
  it('renders each kind', () => {
    // The form of the first sentence is the one the product brief gives.
    expect(describeRule({ id: 'a', title: '', kind: 'never', what: { signal: '%QX0.1', value: 'on' }, while: { signal: '%IX0.2', value: 'off' } }, labels)).toBe(
      'Never %QX0.1 (Robot start) on while %IX0.2 (Guard closed) off',
    );
    expect(
      describeRule({ id: 'b', title: '', kind: 'only-if', what: { signal: '%QX0.1', value: 'on' }, requires: [{ signal: '%IX0.2', value: 'on' }, { signal: '%IX0.3', value: 'on' }] }, labels),
    ).toBe('%QX0.1 (Robot start) on only if %IX0.2 (Guard closed) on and %IX0.3 (E-stop healthy) on');
    expect(describeRule({ id: 'c', title: '', kind: 'within', after: { signal: '%IX0.0', value: 'on' }, expect: { signal: '%QX0.1', value: 'on' }, scans: 3 }, labels)).toBe(
      'After %IX0.0 (Start) turns on, %QX0.1 (Robot start) on within 3 scans',
    );
    expect(describeRule({ id: 'd', title: '', kind: 'within', trigger: 'holds', after: { signal: '%IX0.0', value: 'on' }, expect: { signal: '%QX0.1', value: 'off' }, scans: 0 })).toBe(
      'Whenever %IX0.0 on, %QX0.1 off in the same scan',
    );
  });
  it('brackets combinations and renders not', () => {
    const text = describeRule({
      id: 'e',
      title: '',
      kind: 'never',
      what: { all: [{ signal: '%QX0.1', value: 'on' }, { not: { signal: '%MX0.0', value: 'on' } }] },
      while: { any: [{ signal: '%IX0.2', value: 'off' }, { signal: '%IX0.3', value: 'off' }] },
    });
    expect(text).toBe('Never (%QX0.1 on and not %MX0.0 on) while (%IX0.2 off or %IX0.3 off)');
  });
  it('labels a cell\'s bits by the device wired to them', () => {
    // starter.ts wires start, stop and e-stop to %IX0.0..2 and the Running lamp to %QX0.0.
    expect(signalLabels(starterCell as Parameters<typeof signalLabels>[0])).toMatchObject({
      '%IX0.0': 'Start',
      '%IX0.1': 'Stop',
      '%IX0.2': 'Emergency stop',
      '%QX0.0': 'Running',
    });
    // pick-and-place.ts: %QX0.0 runs to controller channel 0, point-map label "Start"; the
    // recipe word's bits have no single-bit label, so their WORD_OUT block gives none either.
    const labels = signalLabels(pickAndPlaceCell as Parameters<typeof signalLabels>[0]);
    expect(labels['%QX0.0']).toBe('controller Start');
    expect(labels['%QX2.0']).toBeUndefined();
  });
});
