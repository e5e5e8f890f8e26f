/**
 * Who is asking. The session cookie is next-auth's JWT carrying the user id and a session
 * version only; the user, their memberships and roles are re-read from the database on every
 * request, so removing a member, changing a role or "sign out everywhere" takes effect at once.
 */
import { decode } from "next-auth/jwt";
import { eq } from "drizzle-orm";
import { read } from "@/db/write";
import { users, type User } from "@/db/schema";
import { env } from "@/lib/env";

/** next-auth's session cookie name (the __Secure- prefix is used on https). */
export function sessionCookieName(): string {
  return env().NEXTAUTH_URL.startsWith("https://") ? "__Secure-next-auth.session-token" : "next-auth.session-token";
}

/** Session lifetime, seconds. Moderate on purpose: a JWT cannot be revoked before it expires,
 * which is why the session version is also checked on every request. */
export const SESSION_MAX_AGE_S = 12 * 60 * 60;

export interface SessionClaims {
  uid: string;
  sv: number;
}

/** Reads one cookie from a Cookie header. */
export function readCookie(header: string | null, name: string): string | undefined {
  if (!header) return undefined;
  for (const part of header.split(";")) {
    const i = part.indexOf("=");
    if (i < 0) continue;
    if (part.slice(0, i).trim() === name) return decodeURIComponent(part.slice(i + 1).trim());
  }
  return undefined;
}

/** The signed-in user for a session token, or null (expired, tampered, unknown user, old version). */
export async function userFromSessionToken(token: string | undefined): Promise<User | null> {
  if (!token) return null;
  let claims: Record<string, unknown> | null;
  try {
    claims = (await decode({ token, secret: env().NEXTAUTH_SECRET })) as Record<string, unknown> | null;
  } catch {
    return null;
  }
  const uid = typeof claims?.uid === "string" ? claims.uid : undefined;
  const sv = typeof claims?.sv === "number" ? claims.sv : undefined;
  if (!uid || sv === undefined) return null;
  const db = await read();
  const user = await db.query.users.findFirst({ where: eq(users.id, uid) });
  if (!user || user.sessionVersion !== sv) return null;
  return user;
}

/** The signed-in user of a route handler's request, or null. */
export async function userFromRequest(req: Request): Promise<User | null> {
  return userFromSessionToken(readCookie(req.headers.get("cookie"), sessionCookieName()));
}
