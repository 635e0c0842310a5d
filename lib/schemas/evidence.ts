import { z } from 'zod';
import { eventLogSchema, faultCardSchema, interlockRuleSchema, rulesSchema } from '@/simulator';

/**
 * Bodies and params of the changeover-evidence routes: a cell's interlock rules and scenarios,
 * keeping a run as a scenario, proofs and checks jobs, and written acceptances.
 */

export const cellRuleParamSchema = z.object({ id: z.uuid(), ruleId: z.uuid() });
export const cellScenarioParamSchema = z.object({ id: z.uuid(), scenarioId: z.uuid() });
export const changeoverVerdictParamSchema = z.object({ id: z.uuid(), verdictId: z.uuid() });
export const changeoverCheckParamSchema = z.object({ id: z.uuid(), checkId: z.uuid() });

/**
 * One interlock rule as the form sends it: a title and the rule (kind and conditions). The
 * rule is checked by the engine's own schema, its problems reported under `rule.…`.
 */
export const interlockRuleInputSchema = z
  .object({
    title: z.string().trim().min(1, { message: 'Give the rule a short title.' }).max(200),
    rule: z.record(z.string(), z.unknown()),
  })
  .transform((input, ctx) => {
    const { id: _id, title: _title, ...rule } = input.rule;
    const parsed = interlockRuleSchema.safeParse({ ...rule, id: 'rule', title: input.title });
    if (!parsed.success) {
      for (const issue of parsed.error.issues) ctx.addIssue({ code: 'custom', path: ['rule', ...issue.path.map((p) => (typeof p === 'symbol' ? String(p) : p))], message: issue.message });
      return z.NEVER;
    }
    const { id: _i, title: _t, ...body } = parsed.data;
    return { title: input.title, body };
  });
export type InterlockRuleInputBody = z.output<typeof interlockRuleInputSchema>;

/** Longest scenario a cell keeps (cell time): two hours, longer than any drill's time limit. */
export const MAX_SCENARIO_MS = 2 * 3_600_000;

const scenarioName = z.string().trim().min(1, { message: 'Name the scenario.' }).max(120);
const description = z.string().trim().max(2000);

/** A scenario in the headless runner's formats (events and rules files), e.g. an import. */
export const scenarioInputSchema = z
  .object({
    name: scenarioName,
    description: description.default(''),
    events: eventLogSchema,
    rules: rulesSchema.max(100).default([]),
    faults: z.array(faultCardSchema).max(16).default([]),
    seed: z.number().int().min(0).max(0xffffffff).nullable().default(null),
    durationMs: z.number().int().min(0).max(MAX_SCENARIO_MS),
  })
  .superRefine((s, ctx) => {
    s.events.forEach((e, i) => {
      if (i > 0 && e.t < s.events[i - 1].t) ctx.addIssue({ code: 'custom', path: ['events', i, 't'], message: 'Events must be in time order.' });
      if (e.t > s.durationMs) ctx.addIssue({ code: 'custom', path: ['events', i, 't'], message: 'This event comes after the end of the scenario.' });
    });
    const ids = new Set<string>();
    s.rules.forEach((r, i) => {
      if (ids.has(r.id)) ctx.addIssue({ code: 'custom', path: ['rules', i, 'id'], message: 'Rule ids must be unique.' });
      ids.add(r.id);
    });
  });
export type ScenarioInput = z.output<typeof scenarioInputSchema>;

/** Renaming a scenario, rewriting its description or its rules. */
export const scenarioPatchSchema = z
  .object({ name: scenarioName.optional(), description: description.optional(), rules: rulesSchema.max(100).optional() })
  .refine((p) => p.name !== undefined || p.description !== undefined || p.rules !== undefined, { message: 'Nothing to change.' })
  .superRefine((p, ctx) => {
    const ids = new Set<string>();
    (p.rules ?? []).forEach((r, i) => {
      if (ids.has(r.id)) ctx.addIssue({ code: 'custom', path: ['rules', i, 'id'], message: 'Rule ids must be unique.' });
      ids.add(r.id);
    });
  });

/** Keeping a finished run as a scenario of its cell. */
export const keepScenarioSchema = z.object({ name: scenarioName, description: description.default('') });

/** A written acceptance of a violation or a changed outcome. */
export const acceptanceSchema = z.object({
  reason: z.string().trim().min(10, { message: 'Say why in at least 10 characters: the reason goes into the signed record.' }).max(2000),
});
