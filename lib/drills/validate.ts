import { compilePredicate, createCell } from '@/simulator';
import type { DrillInput } from '@/lib/schemas/drills';

/**
 * Checks a drill against its base cell document with the engine itself: every fault card must
 * arm on the cell (its device, row or module exists and is of the right type), every rule
 * signal must exist on the cell (or be one of the drill's `fault.<card>` signals), and the
 * answer's location must name something in the cell. Returns field errors keyed by path
 * (`faults.0.device`, `rules.2.rule.p.signal`, `answer.location`), empty when all is well.
 */
export function drillProblems(document: unknown, input: DrillInput): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  const add = (path: (string | number)[], message: string) => (out[path.join('.')] ??= []).push(message);
  const made = createCell(document, { faults: input.faults });
  if (!made.ok) {
    for (const p of made.errors) {
      if (p.path[0] === 'options' && p.path[1] === 'faults') add(['faults', ...p.path.slice(2)], p.message);
      else add(['cellVersion'], `The base cell does not run: ${p.message}`);
    }
    return out;
  }
  const cell = made.value;
  const names = new Set(cell.signalNames());
  const snapshot = cell.snapshot();
  cell.dispose();
  for (const f of input.faults) names.add(`fault.${f.id}`);
  const ids = new Set(input.faults.map((f) => f.id));
  if (ids.size !== input.faults.length) add(['faults'], 'Fault card ids must be unique.');
  const ruleIds = new Set<string>();
  input.rules.forEach((w, i) => {
    if (ruleIds.has(w.rule.id)) add(['rules', i, 'rule', 'id'], 'Rule ids must be unique.');
    ruleIds.add(w.rule.id);
    const known = (n: string) => names.has(n);
    const p = compilePredicate(w.rule.p, known, ['rules', i, 'rule', 'p']);
    if (!p.ok) for (const e of p.errors) add(e.path, e.message);
    if (w.rule.kind === 'after') {
      const e = compilePredicate(w.rule.event, known, ['rules', i, 'rule', 'event']);
      if (!e.ok) for (const x of e.errors) add(x.path, x.message);
    }
  });
  const places = new Set<string>();
  for (const d of snapshot.devices) places.add(d.id.toLowerCase());
  for (const w of snapshot.wires) places.add(w.id.toLowerCase());
  for (const r of snapshot.controller.pointMap) places.add(r.id.toLowerCase());
  for (const r of snapshot.controller.staged ?? []) places.add(r.id.toLowerCase());
  const doc = document as { plc?: { modules?: { id: string }[] }; controller?: { modules?: { id: string }[] } };
  for (const m of [...(doc.plc?.modules ?? []), ...(doc.controller?.modules ?? [])]) places.add(m.id.toLowerCase());
  places.add('link');
  const unknown = input.answer.location
    .toLowerCase()
    .split(/[\s,+;/|]+/)
    .filter(Boolean)
    .filter((x) => !places.has(x));
  if (unknown.length > 0) add(['answer', 'location'], `Not in the base cell: ${unknown.join(', ')}.`);
  return out;
}
