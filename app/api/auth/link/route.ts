import { z } from "zod";
import { publicRoute } from "@/lib/auth/guard";
import { requestLoginLink } from "@/lib/auth/accounts";
import { emailSchema } from "@/lib/auth/schemas";
import { clientIp } from "@/lib/auth/options";
import { parseJson } from "@/lib/http";

const schema = z.object({ email: emailSchema, next: z.string().max(500).optional() });

// POST /api/auth/link – e-mail a single-use sign-in link (same answer whether or not the account exists)
export const POST = publicRoute(async ({ req }) => {
  const { email, next } = await parseJson(req, schema);
  await requestLoginLink(email, clientIp(req.headers), next);
  return { ok: true, message: `If an account exists for ${email}, a sign-in link is on its way. It expires in 15 minutes.` };
});
