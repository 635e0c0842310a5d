import { z } from 'zod';
import { faultCardSchema, ruleSchema, FAULT_KINDS } from '@/simulator';
import { EDITABLE_AREAS, type DrillInput, type DrillPermissions, type WeightedRule } from '@/db/types/drills';
import type { Proven, SameShape } from './same-shape';

// The stored drill shapes live below db/ and lib/ (db/types/drills.ts); the schemas below are checked against them.
export { ASSET_TYPES, EDITABLE_AREAS, type AssetType, type Diagnosis, type DrillInput, type DrillPermissions, type EditableArea, type WeightedRule } from '@/db/types/drills';

/**
 * What a student may name as the cause: any fault card kind, or one of two configuration
 * faults that live in the cell document rather than in a card (a point-map change left
 * staged, a word point decoded in the wrong encoding). The list is public: it is the
 * catalogue the diagnosis form offers, not the answer.
 */
export const CONFIG_FAULT_KINDS = ['staged-not-applied', 'wrong-word-encoding'] as const;
export const DIAGNOSIS_KINDS = [...FAULT_KINDS, ...CONFIG_FAULT_KINDS] as readonly string[];
export type DiagnosisKind = (typeof DIAGNOSIS_KINDS)[number];

/** Limits of one drill. */
export const DRILL_LIMITS = {
  titleChars: 160,
  briefChars: 40_000,
  faults: 16,
  objectives: 20,
  objectiveChars: 300,
  rules: 40,
  weight: 1000,
  timeLimitMinMs: 1000,
  timeLimitMaxMs: 4 * 3_600_000,
} as const;

const weight = z.number().int().min(0).max(DRILL_LIMITS.weight);

/** A rule of the engine (simulator/trace/rules.ts) with the points it is worth. */
export const weightedRuleSchema = z.object({ rule: ruleSchema, weight });
type _WeightedRuleFits = Proven<SameShape<z.output<typeof weightedRuleSchema>, WeightedRule>>;

export const diagnosisKindSchema = z.string().refine((k) => DIAGNOSIS_KINDS.includes(k), { message: 'Choose a kind from the fault catalogue.' });
/** Where: a device id, a wiring row id (two, comma-separated, for swapped wires), a module or point-map row id. */
export const locationSchema = z.string().trim().min(1, { message: 'Say where.' }).max(200);

export const permissionsSchema = z.object({
  forceAllowed: z.boolean(),
  editable: z.array(z.enum(EDITABLE_AREAS)).max(EDITABLE_AREAS.length),
});
type _PermissionsFit = Proven<SameShape<z.output<typeof permissionsSchema>, DrillPermissions>>;

/**
 * A drill as a trainer writes it. Fault cards and rules are checked against the engine's own
 * schemas here (an unknown kind is a 422 naming `faults.N.kind`), then against the base cell
 * (devices, rows and signals exist) by lib/drills/validate.ts.
 */
export const drillInputSchema = z.object({
  title: z.string().trim().min(3, { message: 'Use at least 3 characters.' }).max(DRILL_LIMITS.titleChars),
  cellId: z.uuid({ message: 'Choose the base cell.' }),
  cellVersion: z.number().int().min(1),
  brief: z.string().max(DRILL_LIMITS.briefChars).default(''),
  faults: z.array(faultCardSchema).max(DRILL_LIMITS.faults),
  objectives: z.array(z.string().trim().min(1).max(DRILL_LIMITS.objectiveChars)).max(DRILL_LIMITS.objectives).default([]),
  rules: z.array(weightedRuleSchema).max(DRILL_LIMITS.rules).default([]),
  answer: z.object({ kind: diagnosisKindSchema, location: locationSchema }),
  diagnosisWeight: weight.default(10),
  timeLimitMs: z.number().int().min(DRILL_LIMITS.timeLimitMinMs).max(DRILL_LIMITS.timeLimitMaxMs),
  permissions: permissionsSchema.default({ forceAllowed: true, editable: ['point-map'] }),
});
type _DrillInputFits = Proven<SameShape<z.output<typeof drillInputSchema>, DrillInput>>;

/** A partial update: every field optional, same checks. */
export const drillPatchSchema = drillInputSchema.partial();

export const drillIdParamSchema = z.object({ id: z.uuid() });
export const drillAssetParamSchema = z.object({ id: z.uuid(), assetId: z.uuid() });
export const assignmentIdParamSchema = z.object({ id: z.uuid() });

export const assignSchema = z
  .object({
    cohortId: z.uuid({ message: 'Choose a cohort.' }),
    opensAt: z.iso.datetime({ offset: true, message: 'Give the opening date and time.' }),
    closesAt: z.iso.datetime({ offset: true, message: 'Give the closing date and time.' }),
  })
  .refine((a) => Date.parse(a.closesAt) > Date.parse(a.opensAt), { path: ['closesAt'], message: 'The drill must close after it opens.' });
export type AssignInput = z.infer<typeof assignSchema>;

/** Brief images: at most 1 MiB, PNG, JPEG, WebP or GIF (sniffed from the bytes, never the client's word). */
export const MAX_ASSET_BYTES = 1_048_576;
export const assetNameSchema = z.string().trim().min(1).max(200).regex(/^[^/\\\0]+$/, { message: 'A file name without slashes.' });
