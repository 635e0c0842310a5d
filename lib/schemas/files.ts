import { z } from 'zod';

/** GET /api/runs/[id]/archive/[archiveId]: a run and one of its exported archives. */
export const runArchiveParamSchema = z.object({ id: z.uuid(), archiveId: z.uuid() });
