/** next-auth shows a thrown authorize() message to the visitor, so internals must never reach it. */
import { describe, expect, it, vi } from 'vitest';
import { SIGN_IN_MESSAGES } from '@/lib/auth/messages';

vi.mock('@/lib/auth/credentials', () => ({
  requestAddress: () => '192.0.2.200',
  authenticate: vi.fn(async () => {
    throw new Error('select count(*) from "sign_in_failures" - relation "sign_in_failures" does not exist');
  }),
}));

describe('credentials provider', () => {
  it('turns an internal failure into the generic "unavailable" message', async () => {
    const { authOptions } = await import('@/lib/auth/options');
    const provider = authOptions().providers[0] as unknown as {
      options: { authorize: (c: Record<string, string>, req: { headers: Record<string, string> }) => Promise<unknown> };
    };
    vi.spyOn(console, 'error').mockImplementation(() => {});
    const attempt = provider.options.authorize({ email: 'a@example.test', password: 'x' }, { headers: {} });
    await expect(attempt).rejects.toThrow(SIGN_IN_MESSAGES.unavailable);
    await expect(provider.options.authorize({ email: 'a@example.test', password: 'x' }, { headers: {} })).rejects.not.toThrow(/relation|select/);
  });
});
