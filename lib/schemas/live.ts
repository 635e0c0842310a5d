import { z } from 'zod';

/** A trainer's hint or message on an assignment: to one student (`to`) or to all (`to: null`). */
export const runMessageSchema = z.object({
  kind: z.enum(['hint', 'message']).default('message'),
  body: z.string().trim().min(1, 'Write the message.').max(2000),
  to: z.uuid().nullable().default(null),
});
export type RunMessageInput = z.infer<typeof runMessageSchema>;

/** `?format=csv` for the findings download. */
export const findingsQuerySchema = z.object({ format: z.enum(['json', 'csv']).default('json') });
