import { publicRoute } from "@/lib/auth/guard";
import { signUp } from "@/lib/auth/accounts";
import { signUpSchema } from "@/lib/auth/schemas";
import { consume } from "@/lib/rate-limit";
import { clientIp } from "@/lib/auth/options";
import { created, parseJson } from "@/lib/http";

// POST /api/signup – create an account and its first workspace (the caller becomes its owner)
export const POST = publicRoute(async ({ req }) => {
  const input = await parseJson(req, signUpSchema);
  await consume([{ key: `signup:ip:${clientIp(req.headers)}`, max: 20, windowMs: 60 * 60_000 }], "Too many sign-ups from this address. Try again in an hour.");
  const { user, workspaceSlug } = await signUp(input);
  return created({ user: { id: user.id, email: user.email, name: user.name }, workspaceSlug });
});
