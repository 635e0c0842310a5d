import { ApiError, type ApiStatus } from '@/lib/api/errors';
import type { TokenRefusal } from '@/db/tokens';

/** Why a single-use link (an invitation, a password reset) cannot be redeemed now. */
export type LinkRefusal = TokenRefusal | 'account-exists';

/** The pages that redeem a link; each words the same refusal for its reader. */
export type LinkUse = 'accept-invitation' | 'join-cohort' | 'reset-password';

/**
 * The one mapping from a refusal to its status: a link that never was (or is not this
 * account's) is 404, so tokens reveal nothing; one that was real but is spent, withdrawn,
 * out of date or already has its account is 409.
 */
export const LINK_REFUSAL_STATUS: Record<LinkRefusal, ApiStatus> = {
  invalid: 404,
  used: 409,
  revoked: 409,
  expired: 409,
  'account-exists': 409,
};

const WORDS: Record<LinkUse, Partial<Record<LinkRefusal, string>>> = {
  'accept-invitation': {
    invalid: 'This invitation link is not valid.',
    used: 'This invitation was already used. Sign in instead.',
    revoked: 'This invitation was withdrawn by the trainer.',
    expired: 'This invitation has expired. Ask your trainer for a new one.',
    'account-exists': 'An account with this address exists. Sign in and open the link again to join.',
  },
  'join-cohort': {
    invalid: 'This invitation link is not valid for your account.',
    used: 'This invitation is already used.',
    revoked: 'This invitation was withdrawn by the trainer.',
    expired: 'This invitation has expired. Ask your trainer for a new one.',
  },
  'reset-password': {
    invalid: 'This reset link is not valid.',
    used: 'This reset link was already used.',
    expired: 'This reset link has expired. Ask for a new one.',
  },
};

/** The ApiError a route throws when a link is refused: its status from LINK_REFUSAL_STATUS, its words from the page's use. */
export function linkRefused(use: LinkUse, reason: LinkRefusal): ApiError {
  return new ApiError(LINK_REFUSAL_STATUS[reason], WORDS[use][reason] ?? 'This link cannot be used.');
}
