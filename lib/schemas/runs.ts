import { z } from 'zod';
import { cellEventSchema } from '@/simulator';
import type { Diagnosis } from '@/db/types/drills';
import { diagnosisKindSchema, locationSchema } from './drills';
import type { Proven, SameShape } from './same-shape';

// A diagnosis is stored with its run (db/types/drills.ts); the schema is checked against it.
export type { Diagnosis } from '@/db/types/drills';

/** Limits of one batch: a client sends a batch every second or two, so these are generous. */
/**
 * `bodyBytes` bounds one request body: a batch may carry `download` events (a whole logic
 * sheet, wiring or routine), so it is sized for a few full-size edits, not for the largest
 * possible cell document; a larger body is refused with 413 before it is parsed.
 */
export const BATCH_LIMITS = { events: 2000, keyChars: 100, maxMs: 30 * 86_400_000, bodyBytes: 4 * 1024 * 1024 } as const;

const ms = z.number().int().min(0).max(BATCH_LIMITS.maxMs);

/**
 * One batch of a run's event log. `key` makes a retry safe (the same key returns the first
 * answer); `seq` counts batches from 1 without gaps; `untilMs` is the cell time the client has
 * reached (monotonic); each event carries the cell time it happened at.
 */
export const batchSchema = z.object({
  key: z.string().min(8).max(BATCH_LIMITS.keyChars).regex(/^[A-Za-z0-9_.:-]+$/, { message: 'Letters, digits and _ . : - only.' }),
  seq: z.number().int().min(1),
  untilMs: ms,
  events: z.array(z.object({ t: ms, event: cellEventSchema })).max(BATCH_LIMITS.events),
});
export type BatchInput = z.infer<typeof batchSchema>;

export const diagnosisSchema = z.object({ kind: diagnosisKindSchema, location: locationSchema, note: z.string().max(2000).default('') });
type _DiagnosisFits = Proven<SameShape<z.output<typeof diagnosisSchema>, Diagnosis>>;

/** Submit: a drill run needs a diagnosis; a practice run may finish without one. */
export const submitSchema = z.object({ diagnosis: diagnosisSchema.optional() });

export const runIdParamSchema = z.object({ id: z.uuid() });

export const viewQuerySchema = z.object({ t: z.coerce.number().int().min(0).max(BATCH_LIMITS.maxMs).optional() });

export const pageQuerySchema = z.object({
  page: z.coerce.number().int().min(1).max(1_000_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(5000).default(500),
});

export const practiceStartSchema = z.object({
  cellId: z.uuid({ message: 'Choose a cell.' }),
  version: z.number().int().min(1).optional(),
  /**
   * Practice only (never graded): the browser may name the seed its worker already runs, so a run
   * opened after "Restart run" replays exactly what the student saw.
   */
  seed: z.number().int().min(0).max(0xffffffff).optional(),
});

export const overrideSchema = z.object({
  grade: z.number().min(0).max(100).nullable(),
  reason: z.string().trim().min(3, { message: 'Give a reason (at least 3 characters).' }).max(1000),
});

export const gradebookQuerySchema = z.object({ cohort: z.uuid({ message: 'Choose a cohort.' }) });
