import 'server-only';
import { env } from '@/lib/env';
import { emailSchema } from '@/lib/schemas/auth';
import type { InviteResult } from '@/lib/schemas/cohorts';
import { sendMail } from '@/lib/mail/send';
import { invitationMail } from '@/lib/mail/templates';
import type { CohortSummary } from '@/db/cohorts';
import type { User } from '@/db/users';
import { INVITATION_TTL_DAYS, createInvitation, revokeInvitation } from '@/db/invitations';

const REASONS = {
  'already-member': 'Already a member of this cohort.',
  'already-invited': 'Already invited; the invitation is still open.',
  'not-a-student': 'This address belongs to an account that is not a student.',
} as const;

/**
 * Invite each address on its own: a bad address is reported with its reason
 * and the good ones are still invited and mailed. A message that cannot be
 * sent withdraws its invitation, so no open invitation exists that nobody got.
 */
export async function inviteAddresses(cohort: CohortSummary, inviter: User, addresses: string[]): Promise<InviteResult[]> {
  const results: InviteResult[] = [];
  const seen = new Set<string>();
  for (const raw of addresses) {
    const parsed = emailSchema.safeParse(raw);
    if (!parsed.success) {
      results.push({ email: raw, status: 'rejected', reason: 'Not a valid e-mail address.' });
      continue;
    }
    const email = parsed.data;
    if (seen.has(email)) {
      results.push({ email, status: 'rejected', reason: 'Listed more than once.' });
      continue;
    }
    seen.add(email);
    const outcome = await createInvitation(cohort.id, inviter.id, email);
    if (outcome.status !== 'invited') {
      results.push({ email, status: 'rejected', reason: REASONS[outcome.status] });
      continue;
    }
    const link = `${env().APP_URL}/invite/${outcome.token}`;
    try {
      await sendMail(
        invitationMail({ to: email, cohortName: cohort.name, trainerName: inviter.name, link, expiresInDays: INVITATION_TTL_DAYS }),
      );
      results.push({ email, status: 'invited' });
    } catch (err) {
      console.error('[mail] invitation not sent', err);
      await revokeInvitation(cohort.id, outcome.invitationId);
      results.push({ email, status: 'rejected', reason: 'The e-mail could not be sent; try again later.' });
    }
  }
  return results;
}
