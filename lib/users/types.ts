// A person's account: the stored shape lives below db/ and lib/ (db/types/users.ts); re-exported for the browser.
export type { User } from '@/db/types/users';
