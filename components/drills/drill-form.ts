/**
 * The drill editor's form values and their conversion to and from the drills API's input
 * (lib/schemas/drills.ts). A condition is kept as the engine's own predicate tree (a signal
 * compared with a value, combined with all / any / not), which the rule builder edits in
 * place (components/rules/), so every stored drill round-trips without loss.
 */
import { z } from 'zod';
import { FAULT_KINDS, type FaultCard, type SignalPredicate } from '@/simulator';
import { DIAGNOSIS_KINDS, EDITABLE_AREAS, type DrillInput } from '@/lib/schemas/drills';
import { leaves, type Tree } from '@/components/rules/condition-tree';
import { newTraceLeaf, type TraceLeaf } from '@/components/rules/leaf-editors';

export const OPS = ['==', '!=', '>', '>=', '<', '<='] as const;
export const RULE_KINDS = ['never', 'always', 'after', 'eventually'] as const;

/** Which fields each fault kind needs (the engine's faultCardSchema). */
export const FAULT_FIELDS: Record<(typeof FAULT_KINDS)[number], ('device' | 'row' | 'rows' | 'module' | 'periodMs' | 'probability' | 'factor' | 'ratePerS' | 'volts' | 'leakMa')[]> = {
  'stuck-on': ['device'],
  'stuck-off': ['device'],
  'open-wire': ['row'],
  'short-24v': ['row'],
  'short-0v': ['row'],
  chatter: ['row', 'periodMs', 'probability'],
  'swapped-wires': ['rows'],
  'dead-module': ['module'],
  'link-loss': [],
  'slow-actuator': ['device', 'factor'],
  'analog-drift': ['device', 'ratePerS'],
  'analog-loss': ['device'],
  'sensor-type-mismatch': ['device'],
  'supply-sag': ['volts'],
  'sensor-leakage': ['device', 'leakMa'],
};

/** A condition as the builder edits it: the engine's predicate tree. */
export type ConditionValue = Tree<TraceLeaf>;

/** A condition every row of which names a signal (the builder's blank rows say what is missing). */
const conditionSchema = z.custom<ConditionValue>((v) => typeof v === 'object' && v !== null).superRefine((c, ctx) => {
  const blank = leaves(c).filter((l) => !l.leaf.signal.trim()).length;
  if (blank > 0) ctx.addIssue({ code: 'custom', message: blank === 1 ? 'Choose a signal for every condition.' : `Choose a signal for each of the ${blank} conditions without one.` });
});
/** A condition the form may leave blank (a rule kind that does not use it). */
const optionalCondition = z.custom<ConditionValue>((v) => typeof v === 'object' && v !== null);

const idText = z.string().trim().regex(/^[A-Za-z][A-Za-z0-9_.-]*$/, { message: 'Letters, digits and _ . - (start with a letter).' });

export const drillFormSchema = z.object({
  title: z.string().trim().min(3, { message: 'Use at least 3 characters.' }).max(160),
  cellId: z.string().min(1, { message: 'Choose the base cell.' }),
  cellVersion: z.number().int().min(1, { message: 'Choose a version.' }),
  brief: z.string().max(40_000),
  faults: z.array(
    z.object({
      id: idText,
      label: z.string().max(200),
      kind: z.enum(FAULT_KINDS as unknown as [string, ...string[]]),
      device: z.string(),
      row: z.string(),
      row2: z.string(),
      module: z.string(),
      periodMs: z.number().int().min(1).max(60_000),
      probability: z.number().min(0).max(1),
      factor: z.number().min(1).max(1000),
      ratePerS: z.number().min(-100).max(100),
      volts: z.number().min(0).max(36),
      leakMa: z.number().min(0).max(10),
      trigger: z.enum(['now', 'at', 'when']),
      atMs: z.number().int().min(0),
      when: optionalCondition,
    }),
  ),
  objectives: z.array(z.object({ text: z.string().trim().min(1, { message: 'Write the objective or remove it.' }).max(300) })),
  rules: z.array(
    z.object({
      id: idText,
      label: z.string().max(200),
      kind: z.enum(RULE_KINDS),
      p: conditionSchema,
      event: optionalCondition,
      withinMs: z.number().int().min(0),
      weight: z.number().int().min(0).max(1000),
    }),
  ),
  answerKind: z.string().refine((k) => DIAGNOSIS_KINDS.includes(k), { message: 'Choose a kind.' }),
  answerLocation: z.string().trim().min(1, { message: 'Say where.' }).max(200),
  diagnosisWeight: z.number().int().min(0).max(1000),
  timeLimitMin: z.number().min(1 / 60, { message: 'At least one second.' }).max(240, { message: 'At most 4 hours.' }),
  forceAllowed: z.boolean(),
  editable: z.array(z.enum(EDITABLE_AREAS)),
});
export type DrillFormValues = z.infer<typeof drillFormSchema>;

/** Conditions a rule kind or trigger does not use are not checked; the ones it uses must be complete. */
export const drillFormSchemaChecked = drillFormSchema.superRefine((v, ctx) => {
  const complete = (c: ConditionValue, path: (string | number)[]) => {
    const r = conditionSchema.safeParse(c);
    if (!r.success) for (const i of r.error.issues) ctx.addIssue({ code: 'custom', path, message: i.message });
  };
  v.faults.forEach((f, i) => f.trigger === 'when' && complete(f.when, ['faults', i, 'when']));
  v.rules.forEach((r, i) => r.kind === 'after' && complete(r.event, ['rules', i, 'event']));
});

export const emptyCondition = (): ConditionValue => newTraceLeaf();

export function newFault(index: number): DrillFormValues['faults'][number] {
  return { id: `f${index + 1}`, label: '', kind: 'open-wire', device: '', row: '', row2: '', module: '', periodMs: 200, probability: 0.3, factor: 4, ratePerS: 0.5, volts: 12, leakMa: 1.5, trigger: 'now', atMs: 0, when: emptyCondition() };
}

export function newRule(index: number): DrillFormValues['rules'][number] {
  return { id: `r${index + 1}`, label: '', kind: 'never', p: emptyCondition(), event: emptyCondition(), withinMs: 1000, weight: 10 };
}

/** A typed value from the text field: numbers and booleans as such, anything else as text. */
export function parseValue(text: string): number | string | boolean {
  const t = text.trim();
  if (t === 'true') return true;
  if (t === 'false') return false;
  if (t !== '' && Number.isFinite(Number(t))) return Number(t);
  return t;
}

/** A stored predicate as the builder's tree (a copy, so edits never reach the stored drill). */
export function toCondition(p: SignalPredicate | undefined): ConditionValue {
  return p ? (structuredClone(p) as ConditionValue) : emptyCondition();
}

/** The predicate of a condition, signal names trimmed. */
export function fromCondition(c: ConditionValue): SignalPredicate {
  const walk = (t: ConditionValue): SignalPredicate => {
    if ('all' in t) return { all: t.all.map(walk) };
    if ('any' in t) return { any: t.any.map(walk) };
    if ('not' in t) return { not: walk(t.not) };
    return { signal: t.signal.trim(), op: t.op, value: t.value };
  };
  return walk(c);
}

/** A stored drill (or nothing: a new one) as form values. */
export function toFormValues(d: (DrillInput & { id?: string }) | null, defaults: { cellId: string; cellVersion: number }): DrillFormValues {
  if (!d) {
    return {
      title: '',
      cellId: defaults.cellId,
      cellVersion: defaults.cellVersion,
      brief: '## What the operator reports\n\n',
      faults: [newFault(0)],
      objectives: [{ text: 'Name the fault and where it is.' }],
      rules: [],
      answerKind: 'open-wire',
      answerLocation: '',
      diagnosisWeight: 10,
      timeLimitMin: 10,
      forceAllowed: true,
      editable: ['point-map'],
    };
  }
  return {
    title: d.title,
    cellId: d.cellId,
    cellVersion: d.cellVersion,
    brief: d.brief,
    faults: d.faults.map((f, i) => {
      const base = newFault(i);
      const any = f as Record<string, unknown>;
      return {
        ...base,
        id: f.id,
        label: f.label ?? '',
        kind: f.kind,
        device: typeof any.device === 'string' ? any.device : '',
        row: typeof any.row === 'string' ? any.row : Array.isArray(any.rows) ? String(any.rows[0]) : '',
        row2: Array.isArray(any.rows) ? String(any.rows[1]) : '',
        module: typeof any.module === 'string' ? any.module : '',
        periodMs: typeof any.periodMs === 'number' ? any.periodMs : base.periodMs,
        probability: typeof any.probability === 'number' ? any.probability : base.probability,
        factor: typeof any.factor === 'number' ? any.factor : base.factor,
        ratePerS: typeof any.ratePerS === 'number' ? any.ratePerS : base.ratePerS,
        volts: typeof any.volts === 'number' ? any.volts : base.volts,
        leakMa: typeof any.leakMa === 'number' ? any.leakMa : base.leakMa,
        trigger: f.when ? 'when' : f.at !== undefined ? 'at' : 'now',
        atMs: f.at ?? 0,
        when: toCondition(f.when),
      };
    }),
    objectives: d.objectives.map((text) => ({ text })),
    rules: d.rules.map(({ rule, weight }) => ({
      id: rule.id,
      label: rule.label ?? '',
      kind: rule.kind,
      p: toCondition(rule.p),
      event: rule.kind === 'after' ? toCondition(rule.event) : emptyCondition(),
      withinMs: rule.kind === 'after' || rule.kind === 'eventually' ? rule.withinMs : 1000,
      weight,
    })),
    answerKind: d.answer.kind,
    answerLocation: d.answer.location,
    diagnosisWeight: d.diagnosisWeight,
    timeLimitMin: d.timeLimitMs / 60_000,
    forceAllowed: d.permissions.forceAllowed,
    editable: [...d.permissions.editable],
  };
}

/** Form values as the drills API's input (the server checks it again, against the base cell). */
export function toDrillInput(v: DrillFormValues): DrillInput {
  return {
    title: v.title.trim(),
    cellId: v.cellId,
    cellVersion: v.cellVersion,
    brief: v.brief,
    faults: v.faults.map((f) => {
      const card: Record<string, unknown> = { id: f.id.trim(), kind: f.kind };
      if (f.label.trim()) card.label = f.label.trim();
      const need = FAULT_FIELDS[f.kind as keyof typeof FAULT_FIELDS];
      if (need.includes('device')) card.device = f.device;
      if (need.includes('row')) card.row = f.row;
      if (need.includes('rows')) card.rows = [f.row, f.row2];
      if (need.includes('module')) card.module = f.module;
      if (need.includes('periodMs')) card.periodMs = f.periodMs;
      if (need.includes('probability')) card.probability = f.probability;
      if (need.includes('factor')) card.factor = f.factor;
      if (need.includes('ratePerS')) card.ratePerS = f.ratePerS;
      if (need.includes('volts')) card.volts = f.volts;
      if (need.includes('leakMa')) card.leakMa = f.leakMa;
      if (f.trigger === 'at') card.at = f.atMs;
      if (f.trigger === 'when') card.when = fromCondition(f.when);
      return card as FaultCard;
    }),
    objectives: v.objectives.map((o) => o.text.trim()),
    rules: v.rules.map((r) => {
      const common = { id: r.id.trim(), ...(r.label.trim() ? { label: r.label.trim() } : {}) };
      const p = fromCondition(r.p);
      const rule =
        r.kind === 'after'
          ? { ...common, kind: 'after' as const, event: fromCondition(r.event), withinMs: r.withinMs, p }
          : r.kind === 'eventually'
            ? { ...common, kind: 'eventually' as const, withinMs: r.withinMs, p }
            : { ...common, kind: r.kind, p };
      return { rule, weight: r.weight };
    }),
    answer: { kind: v.answerKind, location: v.answerLocation.trim() },
    diagnosisWeight: v.diagnosisWeight,
    timeLimitMs: Math.round(v.timeLimitMin * 60_000),
    permissions: { forceAllowed: v.forceAllowed, editable: v.editable },
  };
}

/** A server field path (`rules.2.rule.p.signal`, `faults.0.rows.1`) as the form's field name, when there is one. */
export function formPath(serverPath: string): string {
  return serverPath
    .replace(/^rules\.(\d+)\.rule\./, 'rules.$1.')
    .replace(/^faults\.(\d+)\.rows\.1$/, 'faults.$1.row2')
    .replace(/^faults\.(\d+)\.rows(\.0)?$/, 'faults.$1.row')
    .replace(/^faults\.(\d+)\.at$/, 'faults.$1.atMs')
    .replace(/^answer\.kind$/, 'answerKind')
    .replace(/^answer\.location$/, 'answerLocation')
    .replace(/^timeLimitMs$/, 'timeLimitMin')
    .replace(/^objectives\.(\d+)$/, 'objectives.$1.text')
    // A problem inside a condition is shown on the condition's builder as a whole.
    .replace(/^(rules\.\d+\.(?:p|event))\..*$/, '$1')
    .replace(/^(faults\.\d+\.when)\..*$/, '$1');
}
