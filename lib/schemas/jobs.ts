import { z } from 'zod';
import { parseSubject } from '@/lib/jobs/types';

/** `GET /api/jobs/[id]`: a job id. */
export const jobIdParamSchema = z.object({ id: z.uuid() });

/** `GET /api/jobs/stream?subject=drill:<uuid>`: whose jobs to follow. */
export const jobStreamQuerySchema = z.object({
  subject: z
    .string()
    .max(100)
    .transform((s) => s.toLowerCase())
    .refine((s) => parseSubject(s) !== null, { message: 'A subject is `<kind>:<uuid>`, for example drill:<id>.' }),
});
