import { z } from 'zod';

export const idParamSchema = z.object({ id: z.uuid() });
export const invitationParamSchema = z.object({ id: z.uuid(), invitationId: z.uuid() });
export const memberParamSchema = z.object({ id: z.uuid(), userId: z.uuid() });

export const createCohortSchema = z.object({
  name: z.string().trim().min(3, { message: 'Use at least 3 characters.' }).max(80, { message: 'Use at most 80 characters.' }),
  description: z.string().trim().max(500, { message: 'Use at most 500 characters.' }).default(''),
});
export type CreateCohortInput = z.input<typeof createCohortSchema>;

export const MAX_INVITES_PER_REQUEST = 50;

/**
 * Addresses arrive as one list; each is checked on its own so one bad address
 * does not stop the good ones (bad ones come back with their reason).
 */
export const inviteSchema = z.object({
  emails: z
    .array(z.string().max(320))
    .min(1, { message: 'Enter at least one address.' })
    .max(MAX_INVITES_PER_REQUEST, { message: `At most ${MAX_INVITES_PER_REQUEST} addresses at once.` }),
});
export type InviteInput = z.infer<typeof inviteSchema>;

/** Split free text (commas, semicolons, spaces, new lines) into addresses. */
export function splitAddresses(text: string): string[] {
  return text
    .split(/[\s,;]+/)
    .map((s) => s.trim())
    .filter(Boolean);
}

export type InviteResult =
  | { email: string; status: 'invited' }
  | { email: string; status: 'rejected'; reason: string };
