/**
 * Interlock rules: what a maintenance lead states about PLC signals for a proof to check.
 * They are data a form with pickers builds — a kind, and conditions that are a signal with
 * a wanted value, combined with all / any / not — never a formula language.
 *
 * - `never`: never `what` while `while` (both hold after the same scan);
 * - `only-if`: `what` only if every one of `requires` holds (in the same scan);
 * - `within`: after `after` (each scan it turns true — or, with `trigger: 'holds'`, each
 *   scan it is true), `expect` holds at that scan or one of the next `scans` scans.
 *
 * Signals are %IX, %QX and %MX bits: an input as the PLC read it during the scan, an
 * output or memory bit as the scan left it (what the trace shows after the scan).
 */
import { z } from 'zod';
import { formatAddress, parseAddress } from '@/simulator/address/address';
import type { CellDocument } from '@/simulator/schema/cell-document';

/** Deepest nesting of all / any / not a condition may have. */
export const MAX_CONDITION_DEPTH = 16;
/** Longest `within` window, in scans. */
export const MAX_WITHIN_SCANS = 10_000;

/** A condition: a bit with a wanted value, or a combination. */
export type RuleCondition =
  | { signal: string; value: 'on' | 'off' }
  | { all: RuleCondition[] }
  | { any: RuleCondition[] }
  | { not: RuleCondition };

const bitAddress = z.string().superRefine((text, ctx) => {
  const r = parseAddress(text);
  if (!r.ok) {
    for (const e of r.errors) ctx.addIssue({ code: 'custom', message: e.message, params: { code: e.code } });
    return;
  }
  if (r.value.size !== 'X') {
    ctx.addIssue({ code: 'custom', message: `a rule reads bits such as %QX0.1, not ${text}`, params: { code: 'address_size' } });
  }
});

/** Schema of a {@link RuleCondition}. */
export const ruleConditionSchema: z.ZodType<RuleCondition, RuleCondition> = z.lazy(() =>
  z.union([
    z.object({ signal: bitAddress, value: z.enum(['on', 'off']) }).strict(),
    z.object({ all: z.array(ruleConditionSchema).min(1).max(64) }).strict(),
    z.object({ any: z.array(ruleConditionSchema).min(1).max(64) }).strict(),
    z.object({ not: ruleConditionSchema }).strict(),
  ]),
);

const ruleId = z.string().regex(/^[A-Za-z0-9_.:-]{1,64}$/, 'id must be 1..64 letters, digits, _ - . or :');
const common = { id: ruleId, title: z.string().max(200) };

/** Schema of one interlock rule. */
export const interlockRuleSchema = z
  .discriminatedUnion('kind', [
    z.object({ ...common, kind: z.literal('never'), what: ruleConditionSchema, while: ruleConditionSchema }).strict(),
    z.object({ ...common, kind: z.literal('only-if'), what: ruleConditionSchema, requires: z.array(ruleConditionSchema).min(1).max(64) }).strict(),
    z
      .object({
        ...common,
        kind: z.literal('within'),
        after: ruleConditionSchema,
        expect: ruleConditionSchema,
        scans: z.number().int().min(0).max(MAX_WITHIN_SCANS),
        trigger: z.enum(['rises', 'holds']).default('rises'),
      })
      .strict(),
  ])
  .superRefine((rule, ctx) => {
    for (const [key, c] of ruleConditions(rule)) {
      if (conditionDepth(c) > MAX_CONDITION_DEPTH) {
        ctx.addIssue({ code: 'custom', path: key, message: `conditions nest at most ${MAX_CONDITION_DEPTH} deep`, params: { code: 'too_deep' } });
      }
    }
  });

/** A list of rules with unique ids (at most 500). */
export const interlockRulesSchema = z
  .array(interlockRuleSchema)
  .max(500)
  .superRefine((rules, ctx) => {
    const seen = new Set<string>();
    rules.forEach((r, i) => {
      if (seen.has(r.id)) ctx.addIssue({ code: 'custom', path: [i, 'id'], message: `rule id "${r.id}" is used more than once`, params: { code: 'duplicate_id' } });
      seen.add(r.id);
    });
  });

/** A validated interlock rule (defaults applied). */
export type InterlockRule = z.output<typeof interlockRuleSchema>;
/** An interlock rule as written (defaults may be omitted). */
export type InterlockRuleInput = z.input<typeof interlockRuleSchema>;

/** The rule's top-level conditions with their paths inside the rule. */
export function ruleConditions(rule: InterlockRule | InterlockRuleInput): [(string | number)[], RuleCondition][] {
  switch (rule.kind) {
    case 'never':
      return [
        [['what'], rule.what],
        [['while'], rule.while],
      ];
    case 'only-if':
      return [[['what'], rule.what], ...rule.requires.map((c, i): [(string | number)[], RuleCondition] => [['requires', i], c])];
    case 'within':
      return [
        [['after'], rule.after],
        [['expect'], rule.expect],
      ];
  }
}

function conditionDepth(c: RuleCondition): number {
  const stack: [RuleCondition, number][] = [[c, 1]];
  let deepest = 0;
  while (stack.length > 0) {
    const [x, d] = stack.pop() as [RuleCondition, number];
    deepest = Math.max(deepest, d);
    // A pathological document could nest far deeper than the limit: stop looking once over it.
    if (deepest > MAX_CONDITION_DEPTH) return deepest;
    if ('all' in x) for (const y of x.all) stack.push([y, d + 1]);
    else if ('any' in x) for (const y of x.any) stack.push([y, d + 1]);
    else if ('not' in x) stack.push([x.not, d + 1]);
  }
  return deepest;
}

/** Canonical form of a bit address (`%i0.1` → `%IX0.1`); the text itself when it is not one. */
export function canonicalAddress(text: string): string {
  const r = parseAddress(text);
  return r.ok ? formatAddress(r.value) : text;
}

/** Every signal a rule reads, canonical, in first-use order. */
export function ruleAddresses(rule: InterlockRule | InterlockRuleInput): string[] {
  const out: string[] = [];
  const walk = (c: RuleCondition) => {
    if ('signal' in c) {
      const a = canonicalAddress(c.signal);
      if (!out.includes(a)) out.push(a);
    } else if ('all' in c) c.all.forEach(walk);
    else if ('any' in c) c.any.forEach(walk);
    else walk(c.not);
  };
  for (const [, c] of ruleConditions(rule)) walk(c);
  return out;
}

/** Signal labels by canonical address, or a function returning one. */
export type SignalLabels = Record<string, string> | ((address: string) => string | undefined);

function labelOf(labels: SignalLabels | undefined, address: string): string | undefined {
  if (!labels) return undefined;
  return typeof labels === 'function' ? labels(address) : labels[address];
}

function conditionText(c: RuleCondition, labels: SignalLabels | undefined, nested: boolean): string {
  if ('signal' in c) {
    const a = canonicalAddress(c.signal);
    const label = labelOf(labels, a);
    return `${a}${label ? ` (${label})` : ''} ${c.value}`;
  }
  if ('not' in c) return `not ${conditionText(c.not, labels, true)}`;
  const parts = 'all' in c ? c.all : c.any;
  if (parts.length === 1) return conditionText(parts[0], labels, nested);
  const text = parts.map((p) => conditionText(p, labels, true)).join('all' in c ? ' and ' : ' or ');
  return nested ? `(${text})` : text;
}

/** A condition in plain English, e.g. `%IX0.2 (Guard closed) off`. */
export function describeCondition(c: RuleCondition, labels?: SignalLabels): string {
  return conditionText(c, labels, false);
}

/**
 * A rule in plain English, e.g. "Never %QX0.1 (Robot start) on while %IX0.2 (Guard closed)
 * off". Labels (see {@link signalLabels}) are shown beside the addresses they name.
 */
export function describeRule(rule: InterlockRule | InterlockRuleInput, labels?: SignalLabels): string {
  const c = (x: RuleCondition) => conditionText(x, labels, true);
  switch (rule.kind) {
    case 'never':
      return `Never ${c(rule.what)} while ${c(rule.while)}`;
    case 'only-if':
      return `${c(rule.what)} only if ${rule.requires.map(c).join(' and ')}`;
    case 'within': {
      const window = rule.scans === 0 ? 'in the same scan' : `within ${rule.scans} scan${rule.scans === 1 ? '' : 's'}`;
      if ((rule.trigger ?? 'rises') === 'holds') return `Whenever ${c(rule.after)}, ${c(rule.expect)} ${window}`;
      const a = rule.after;
      const start =
        'signal' in a
          ? `${canonicalAddress(a.signal)}${labelOf(labels, canonicalAddress(a.signal)) ? ` (${labelOf(labels, canonicalAddress(a.signal))})` : ''} turns ${a.value}`
          : `${c(a)} becomes true`;
      return `After ${start}, ${c(rule.expect)} ${window}`;
    }
  }
}

/**
 * Labels for PLC bits from a cell document, first found wins: the device a wiring row
 * joins to the bit (its label); the controller point a row joins it to (`controller` and
 * the point-map label); the row's own label; the label of a coil or contact block on the
 * bit; the id of a coil block writing it.
 */
export function signalLabels(document: Pick<CellDocument, 'panel' | 'field' | 'wiring' | 'plc' | 'controller'>): Record<string, string> {
  const out: Record<string, string> = {};
  const devices = new Map<string, string>();
  for (const d of [...(document.panel ?? []), ...(document.field ?? [])]) devices.set(d.id, d.label);
  const put = (address: string, label: string | undefined) => {
    const r = parseAddress(address);
    if (!label || !r.ok || r.value.size !== 'X') return;
    const a = formatAddress(r.value);
    if (!(a in out)) out[a] = label;
  };
  const rows = document.wiring ?? [];
  const plcEnd = (row: (typeof rows)[number]) => [row.from, row.to].find((e): e is { plc: string } => 'plc' in e);
  for (const row of rows) {
    const dev = [row.from, row.to].find((e): e is { device: string; terminal: string } => 'device' in e);
    const plc = plcEnd(row);
    if (plc && dev) put(plc.plc, devices.get(dev.device));
  }
  const pointMap = document.controller?.pointMap ?? [];
  for (const row of rows) {
    const plc = plcEnd(row);
    const ch = [row.from, row.to].find((e): e is { controller: { rack: number; slot: number; channel: number } } => 'controller' in e);
    if (!plc || !ch) continue;
    const { rack, slot, channel } = ch.controller;
    // Single-channel points only: a word point's label names the word, not one bit.
    const pm = pointMap.find((m) => m.bits === undefined && m.rack === rack && m.slot === slot && channel >= m.firstChannel && channel < m.firstChannel + m.count);
    const label = pm?.points?.[channel - pm.firstChannel]?.label;
    if (label) put(plc.plc, `controller ${label}`);
  }
  for (const row of rows) {
    const plc = plcEnd(row);
    if (plc) put(plc.plc, row.label);
  }
  const blocks = document.plc?.sheet?.blocks ?? [];
  const coils = ['COIL', 'SET_COIL', 'RESET_COIL'];
  for (const kinds of [coils, ['NO_CONTACT', 'NC_CONTACT']]) {
    for (const b of blocks) if (kinds.includes(b.type) && 'address' in b.params) put(b.params.address, b.label);
  }
  for (const b of blocks) if (coils.includes(b.type) && 'address' in b.params) put(b.params.address, b.id);
  return out;
}
