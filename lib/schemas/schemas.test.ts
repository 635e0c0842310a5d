import { describe, expect, it } from 'vitest';
import { acceptInvitationSchema, emailSchema, setPasswordFormSchema } from './auth';
import { inviteSchema, splitAddresses } from './cohorts';
import { userListQuerySchema } from './admin';
import { fieldErrors } from '@/lib/api/errors';

describe('addresses', () => {
  it('splits free text on commas, semicolons, spaces and new lines', () => {
    expect(splitAddresses(' a@x.test, b@x.test;c@x.test\n\nd@x.test  ')).toEqual(['a@x.test', 'b@x.test', 'c@x.test', 'd@x.test']);
    expect(splitAddresses(' , ;\n')).toEqual([]);
  });

  it('normalises case and whitespace of an e-mail address', () => {
    expect(emailSchema.parse('  Ada.Lindqvist@KestrelVale.TEST ')).toBe('ada.lindqvist@kestrelvale.test');
    expect(emailSchema.safeParse('not-an-address').success).toBe(false);
  });

  it('limits one invitation request to 50 addresses', () => {
    expect(inviteSchema.safeParse({ emails: Array.from({ length: 50 }, (_, i) => `s${i}@x.test`) }).success).toBe(true);
    expect(inviteSchema.safeParse({ emails: Array.from({ length: 51 }, (_, i) => `s${i}@x.test`) }).success).toBe(false);
  });
});

describe('passwords and tokens', () => {
  it('names each bad field of an invitation acceptance', () => {
    const r = acceptInvitationSchema.safeParse({ token: 'short', name: ' ', password: '123' });
    expect(r.success).toBe(false);
    if (!r.success) expect(Object.keys(fieldErrors(r.error)).sort()).toEqual(['name', 'password', 'token']);
  });

  it('reports differing passwords on the confirmation field', () => {
    const r = setPasswordFormSchema.safeParse({ password: 'long-enough-one', confirm: 'long-enough-two' });
    expect(r.success).toBe(false);
    if (!r.success) expect(fieldErrors(r.error)).toEqual({ confirm: ['The passwords differ.'] });
  });
});

describe('admin user list query', () => {
  it('fills defaults and coerces numbers from the query string', () => {
    expect(userListQuerySchema.parse({ page: '3' })).toEqual({ sort: 'name', dir: 'asc', page: 3, pageSize: 10 });
  });

  it('only sorts by listed columns', () => {
    expect(userListQuerySchema.safeParse({ sort: 'password_hash' }).success).toBe(false);
  });
});
