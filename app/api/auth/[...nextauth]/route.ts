import NextAuth from 'next-auth';
import { authOptions } from '@/lib/auth/options';

type Ctx = { params: Promise<{ nextauth: string[] }> };

async function handler(req: Request, ctx: Ctx): Promise<Response> {
  const h = NextAuth(authOptions()) as (req: Request, ctx: Ctx) => Promise<Response>;
  return h(req, ctx);
}

export { handler as GET, handler as POST };
