import { z } from 'zod';

/**
 * Runs in the browser before the app's own code (Next.js 16, instrumentation-client.js).
 *
 * Zod 4 compiles object parsers with `new Function` when it may, and finds out by trying once
 * when the first object schema is built. The pages of an anonymous visitor forbid eval
 * (lib/security-headers.ts), and the browser reports that try as a CSP violation even though
 * zod catches it. `jitless` skips both the try and the compiled parsers in the browser (zod
 * core's util.allowsEval); the server, where no CSP applies, keeps them.
 */
z.config({ jitless: true });
