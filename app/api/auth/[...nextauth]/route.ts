import NextAuth from 'next-auth';
import { NextRequest } from 'next/server';
import { authOptions } from '@/lib/auth/options';
import { apiRoute } from '@/lib/api/errors';
import { BODY_LIMITS, readBody } from '@/lib/api/body';

type Ctx = { params: Promise<{ nextauth: string[] }> };

const handler = NextAuth(authOptions()) as (req: NextRequest, ctx: Ctx) => Promise<Response>;

export const GET = handler;

/**
 * next-auth reads its forms (sign-in, sign-out) itself; the body goes through the same capped
 * reader and cross-site check as every other route first, so an oversized or foreign post is
 * refused (413 / 403) before next-auth parses anything.
 */
export const POST = apiRoute(async (req: Request, ctx: Ctx) => {
  const bytes = await readBody(req, BODY_LIMITS.auth);
  const again = new NextRequest(req.url, { method: req.method, headers: req.headers, body: bytes.byteLength > 0 ? bytes : undefined });
  return handler(again, ctx);
});
