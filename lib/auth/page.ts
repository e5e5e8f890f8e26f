/**
 * Guards for Server Components: the same permission matrix as the route handlers, turned into
 * navigation: no session → sign-in page, not a member / unknown → 404, role not allowed → 403.
 */
import { cookies } from "next/headers";
import { forbidden, notFound, redirect } from "next/navigation";
import type { User } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { authorize, type WorkspaceContext } from "./guard";
import type { Action } from "./permissions";
import { sessionCookieName, userFromSessionToken } from "./session";

/** The signed-in user of this page request, or null. */
export async function pageUser(): Promise<User | null> {
  const jar = await cookies();
  return userFromSessionToken(jar.get(sessionCookieName())?.value);
}

/** The signed-in user, or a redirect to the sign-in page that comes back to `next`. */
export async function requirePageUser(next: string): Promise<User> {
  const user = await pageUser();
  if (!user) redirect(`/signin?next=${encodeURIComponent(next)}`);
  return user;
}

/** The workspace context for a page, authorised for `action`. */
export async function requirePageContext(slug: string, action: Action, next?: string): Promise<WorkspaceContext> {
  const user = await requirePageUser(next ?? `/w/${slug}`);
  try {
    return await authorize(user, slug, action, { enforceWritable: false });
  } catch (err) {
    if (err instanceof AppError) {
      if (err.code === "not_found") notFound();
      if (err.code === "forbidden") forbidden();
    }
    throw err;
  }
}
