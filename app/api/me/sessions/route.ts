import { userRoute } from "@/lib/auth/guard";
import { bumpSessionVersion } from "@/lib/auth/accounts";

// DELETE /api/me/sessions – sign out everywhere: every session of the caller stops working at once
export const DELETE = userRoute(async ({ user }) => {
  await bumpSessionVersion(user.id);
  return { ok: true };
});
