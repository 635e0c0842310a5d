import type { DefaultSession } from 'next-auth';
import type { Role } from '@/lib/roles';

declare module 'next-auth' {
  interface Session {
    user: DefaultSession['user'] & { id: string; role: Role };
  }
  interface User {
    role: Role;
  }
}

declare module 'next-auth/jwt' {
  interface JWT {
    id: string;
    role: Role;
    /** The account's session generation at sign-in (absent in tokens minted before it existed: 0). */
    gen?: number;
  }
}
