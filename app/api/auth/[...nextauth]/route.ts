import NextAuth from "next-auth";
import { authOptions, clientIp } from "@/lib/auth/options";
import { assertSignInAllowed, RATE_LIMIT_MESSAGE } from "@/lib/auth/accounts";
import { AppError } from "@/lib/errors";
import { appUrl } from "@/lib/env";

const handler = NextAuth(authOptions);

type Ctx = { params: Promise<{ nextauth: string[] }> };

// GET /api/auth/* – next-auth (session, csrf, providers)
export const GET = handler;

// POST /api/auth/* – next-auth; password sign-ins are refused with 429 while rate limited
export async function POST(req: Request, ctx: Ctx): Promise<Response> {
  const { nextauth } = await ctx.params;
  if (nextauth[0] === "callback" && nextauth[1] === "password") {
    const form = await req.clone().formData().catch(() => null);
    const email = String(form?.get("email") ?? "");
    try {
      if (email) await assertSignInAllowed(email, clientIp(req.headers));
    } catch (err) {
      if (err instanceof AppError && err.code === "rate_limited") {
        // `url` keeps next-auth's client happy (it reads ?error=); `error` is our usual shape.
        return Response.json(
          { url: `${appUrl()}/signin?error=rate_limited`, error: { code: "rate_limited", message: RATE_LIMIT_MESSAGE } },
          { status: 429, headers: err.headers },
        );
      }
      throw err;
    }
  }
  return handler(req, ctx);
}
