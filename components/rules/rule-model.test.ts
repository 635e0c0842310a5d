import { describe, expect, it } from 'vitest';
import { cellDocumentSchema, createCell, interlockRuleSchema, pickAndPlaceCell, ruleSchema, type RuleCondition, type SignalPredicate } from '@/simulator';
import { addCondition, depth, leaves, nodeAt, pathKey, removeAt, setGroupOp, toggleNot, unwrapSingle, updateAt, wrapInGroup, type Tree } from './condition-tree';
import { CHOOSE_SIGNAL, describePredicate, interlockSentence, traceRuleSentence } from './sentences';
import { bitSignalOptions, bitValues, optionLabels, searchSignals, shortLabel, traceSignalOptions } from './signal-catalogue';
import { emptyInterlockForm, interlockFormProblems, switchKind, toInterlockBody, toInterlockForm } from './interlock-form-model';

type Bit = { signal: string; value: 'on' | 'off' };
const bit = (signal: string, value: 'on' | 'off' = 'on'): Bit => ({ signal, value });
const doc = cellDocumentSchema.parse(structuredClone(pickAndPlaceCell));

describe('condition tree edits', () => {
  const guardOpen = bit('%IX0.4', 'off');
  const estop = bit('%IX0.2', 'off');

  it('adding under a single condition makes an all group of both', () => {
    expect(addCondition<Bit>(guardOpen, [], estop)).toEqual({ all: [guardOpen, estop] });
  });

  it('adding to a group appends, keeping the op', () => {
    const t: Tree<Bit> = { any: [guardOpen] };
    expect(addCondition(t, [], estop)).toEqual({ any: [guardOpen, estop] });
  });

  it('edits reach nested nodes through not and group steps, leaving the input untouched', () => {
    const t: Tree<Bit> = { all: [guardOpen, { not: { any: [estop, bit('%IX0.1')] } }] };
    const before = JSON.stringify(t);
    const u = updateAt(t, [1, 'not', 1], () => bit('%IX0.3', 'off'));
    expect(nodeAt(u, [1, 'not', 1])).toEqual(bit('%IX0.3', 'off'));
    expect(JSON.stringify(t)).toBe(before);
    expect(() => updateAt(t, [5], (x) => x)).toThrow();
  });

  it('removing the last child of a group removes the group, and a not with it; the root goes to null', () => {
    const t: Tree<Bit> = { all: [guardOpen, { not: { any: [estop] } }] };
    expect(removeAt(t, [1, 'not', 0])).toEqual({ all: [guardOpen] });
    expect(removeAt(t, [0])).toEqual({ all: [{ not: { any: [estop] } }] });
    expect(removeAt<Bit>(guardOpen, [])).toBeNull();
    expect(removeAt<Bit>({ all: [guardOpen] }, [0])).toBeNull();
  });

  it('switches all/any, toggles not both ways, wraps and unwraps', () => {
    const t: Tree<Bit> = { all: [guardOpen, estop] };
    expect(setGroupOp(t, [], 'any')).toEqual({ any: [guardOpen, estop] });
    expect(setGroupOp<Bit>(guardOpen, [], 'any')).toEqual(guardOpen);
    const negated = toggleNot(t, [1]);
    expect(negated).toEqual({ all: [guardOpen, { not: estop }] });
    expect(toggleNot(negated, [1])).toEqual(t);
    expect(wrapInGroup(t, [0], 'any', bit('%IX0.7', 'off'))).toEqual({ all: [{ any: [guardOpen, bit('%IX0.7', 'off')] }, estop] });
    expect(unwrapSingle<Bit>({ any: [guardOpen] }, [])).toEqual(guardOpen);
  });

  it('lists leaves with their paths in reading order, measures depth and keys paths', () => {
    const t: Tree<Bit> = { all: [guardOpen, { not: { any: [estop, bit('%IX0.1')] } }] };
    expect(leaves(t).map((l) => pathKey(l.path))).toEqual(['0', '1.not.0', '1.not.1']);
    expect(depth(t)).toBe(4);
    expect(pathKey([])).toBe('root');
  });

  it('the same edits work on trace predicates, and the result still parses as the engine format', () => {
    const p: SignalPredicate = { signal: 'arm.moving', op: '==', value: 1 };
    const q = toggleNot(addCondition<SignalPredicate & object>(p, [], { signal: 'plc.%IX0.4', op: '==', value: 0 }), [1]);
    const rule = ruleSchema.parse({ id: 'r1', kind: 'never', p: q });
    expect(rule.p).toEqual({ all: [p, { not: { signal: 'plc.%IX0.4', op: '==', value: 0 } }] });
  });
});

describe('rules read back as sentences', () => {
  const labels = optionLabels(bitSignalOptions(doc));

  it('the three interlock kinds, with the labels from the cell', () => {
    expect(interlockSentence({ id: 'a', title: '', kind: 'never', what: bit('%QX0.0'), while: bit('%IX0.4', 'off') }, labels)).toBe(
      'Never %QX0.0 (DI1 Start) on while %IX0.4 (Front guard) off',
    );
    expect(interlockSentence({ id: 'b', title: '', kind: 'only-if', what: bit('%QX0.0'), requires: [bit('%IX0.4'), bit('%IX0.2')] }, labels)).toBe(
      '%QX0.0 (DI1 Start) on only if %IX0.4 (Front guard) on and %IX0.2 (Emergency stop) on',
    );
    expect(interlockSentence({ id: 'c', title: '', kind: 'within', after: bit('%IX0.2', 'off'), expect: bit('%QX1.0'), scans: 2 }, labels)).toBe(
      'After %IX0.2 (Emergency stop) turns off, %QX1.0 (Cell status red tier) on within 2 scans',
    );
  });

  it('groups and nots read with brackets; a blank signal reads as a prompt', () => {
    const rule = { id: 'd', title: '', kind: 'never' as const, what: bit('%QX0.0'), while: { any: [bit('%IX0.4', 'off'), { not: bit('') }] } as RuleCondition };
    expect(interlockSentence(rule, labels)).toBe(`Never %QX0.0 (DI1 Start) on while (%IX0.4 (Front guard) off or not ${CHOOSE_SIGNAL} on)`);
  });

  it('what the builder makes is what the prover accepts', () => {
    const rule = { id: 'e', title: 'Start needs both guards', kind: 'only-if' as const, what: bit('%QX0.0'), requires: [{ all: [bit('%IX0.4'), bit('%IX0.7')] }] };
    expect(interlockRuleSchema.safeParse(rule).success).toBe(true);
  });

  it('trace rules in words: on/off for bits, comparisons for values, durations in units', () => {
    const made = createCell(doc);
    if (!made.ok) throw new Error('demo cell does not build');
    const options = traceSignalOptions(doc, made.value.signalNames());
    made.value.dispose();
    const tl = optionLabels(options);
    const bits = bitValues(options);
    const never = ruleSchema.parse({ id: 'n', kind: 'never', p: { all: [{ signal: 'arm.moving', op: '==', value: 1 }, { signal: 'plc.%IX0.4', op: '==', value: 0 }] } });
    expect(traceRuleSentence(never, tl, bits)).toBe('Never (Arm moving (arm.moving) is on and Front guard (plc.%IX0.4) is off)');
    const after = ruleSchema.parse({ id: 'a', kind: 'after', event: { signal: 'dev.estop.latched', op: '==', value: 1 }, withinMs: 1000, p: { signal: 'ctl.state', op: '!=', value: 'cycling' } });
    expect(traceRuleSentence(after, tl, bits)).toBe('Each time Emergency stop · latched (dev.estop.latched) is on becomes true, Controller state (ctl.state) is not “cycling” within 1 s');
    const eventually = ruleSchema.parse({ id: 'e', kind: 'eventually', withinMs: 20_000, p: { signal: 'ctl.cycles', op: '>=', value: 1 } });
    expect(traceRuleSentence(eventually, tl, bits)).toBe('Within the first 20 s, Cycles completed (ctl.cycles) is at least 1 at least once');
    expect(describePredicate({ not: { signal: '', op: '==', value: 1 } })).toBe(`not ${CHOOSE_SIGNAL} is 1`);
  });
});

describe('signal catalogue', () => {
  const bits = bitSignalOptions(doc);

  it('offers every channel of the digital modules and every address the logic uses, in address order', () => {
    const codes = bits.map((o) => o.code);
    expect(codes.slice(0, 3)).toEqual(['%IX0.0', '%IX0.1', '%IX0.2']);
    expect(codes).toContain('%IX1.7');
    expect(codes).toContain('%QX2.7');
    expect(codes.indexOf('%IX1.7')).toBeLessThan(codes.indexOf('%QX0.0'));
    expect(bits.every((o) => o.bit)).toBe(true);
  });

  it('labels a bit by what it is wired to and details the wire and blocks', () => {
    const guard = bits.find((o) => o.code === '%IX0.4')!;
    expect(guard.label).toBe('Front guard');
    expect(guard.detail).toContain('wire w-guard');
    expect(guard.detail).toContain('guardOk');
    expect(bits.find((o) => o.code === '%QX1.2')!.label).toBe('Cell status green tier');
    expect(bits.find((o) => o.code === '%IX0.7')!.detail).toBe('not wired, not used by the logic');
  });

  it('finds a signal by label, by address, by wire id and by device id', () => {
    expect(searchSignals(bits, 'front guard')[0].code).toBe('%IX0.4');
    expect(searchSignals(bits, '%ix0.4')[0].code).toBe('%IX0.4');
    expect(searchSignals(bits, 'w-estop1').map((o) => o.code)).toEqual(['%IX0.2']);
    expect(searchSignals(bits, 'readyLamp').map((o) => o.code)).toEqual(['%QX1.3']);
    expect(searchSignals(bits, 'guard closed').map((o) => o.code)).toEqual(['%QX0.3']);
    expect(searchSignals(bits, 'no such thing')).toEqual([]);
  });

  it('trace options cover the engine signals with plain labels and know which are bits', () => {
    const made = createCell(doc);
    if (!made.ok) throw new Error('demo cell does not build');
    const names = made.value.signalNames();
    made.value.dispose();
    const options = traceSignalOptions(doc, names, ['fault.f1']);
    const by = new Map(options.map((o) => [o.value, o]));
    for (const n of names) if (n !== 'time') expect(by.has(n), n).toBe(true);
    expect(by.get('dev.estop.latched')).toMatchObject({ label: 'Emergency stop · latched', bit: true });
    expect(by.get('ctl.state')).toMatchObject({ bit: false, texts: expect.arrayContaining(['cycling']) });
    expect(by.get('plc.startEdge.Q')?.bit).toBe(true);
    expect(by.get('fault.f1')?.bit).toBe(true);
    expect(searchSignals(options, 'w-guard').map((o) => o.value)).toEqual(expect.arrayContaining(['plc.%IX0.4', 'wire.w-guard', 'in.w-guard']));
  });

  it('short labels drop the terminal in brackets', () => {
    expect(shortLabel('Cycle start (start:contact)')).toBe('Cycle start');
    expect(shortLabel('DI1 Start (R0.S1.C0), Lamp (lamp:lamp)')).toBe('DI1 Start, Lamp');
  });
});

describe('the interlock rule form', () => {
  it('round-trips every demo rule between the stored body and the form', async () => {
    const { DEMO_INTERLOCK_RULES } = await import('@/db/seeds/demo-evidence');
    for (const r of DEMO_INTERLOCK_RULES) {
      const form = toInterlockForm(r.title, r.body);
      expect(interlockFormProblems(form)).toEqual([]);
      expect(toInterlockBody(form)).toEqual(r.body.kind === 'within' ? { trigger: 'rises', ...r.body } : r.body);
    }
  });

  it('switching the kind carries the main condition across and back', () => {
    const never = { ...emptyInterlockForm(), title: 't', what: bit('%QX0.0'), while: bit('%IX0.4', 'off') };
    const within = switchKind(never, 'within');
    expect(within.after).toEqual(bit('%QX0.0'));
    const onlyIf = switchKind(within, 'only-if');
    expect(onlyIf.what).toEqual(bit('%QX0.0'));
    expect(switchKind(onlyIf, 'never').while).toEqual(bit('%IX0.4', 'off'));
  });

  it('says what is missing before a rule can be saved', () => {
    const blank = emptyInterlockForm();
    expect(interlockFormProblems(blank)).toEqual(['Give the rule a short title.', '2 conditions have no signal yet: choose them.']);
    const word = { ...emptyInterlockForm(), title: 'Word', what: bit('%QW2'), while: bit('%IX0.1') };
    expect(interlockFormProblems(word).join(' ')).toMatch(/bits such as %QX0.1/);
    const window = { ...emptyInterlockForm(), title: 'w', kind: 'within' as const, after: bit('%IX0.1'), expect: bit('%QX0.1'), scans: 20_000 };
    expect(interlockFormProblems(window)).toEqual(['The window is a whole number of scans from 0 to 10,000.']);
  });
});
