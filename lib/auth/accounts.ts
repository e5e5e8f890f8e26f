/**
 * Accounts: sign-up (user + first workspace as owner), password check with rate limits, and
 * single-use sign-in links by e-mail.
 */
import { and, eq, gt, isNull, sql } from "drizzle-orm";
import { write, read } from "@/db/write";
import { loginTokens, memberships, users, workspaces, type User } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { newId, newToken, sha256Hex } from "@/lib/ids";
import { appUrl } from "@/lib/env";
import { sendMail } from "@/lib/mail";
import { auditInsert } from "@/lib/audit";
import { assertNotLimited, consume, hit, type Limit } from "@/lib/rate-limit";
import { trialFields } from "@/lib/billing/trial";
import { dummyHash, hashPassword, verifyPassword } from "./password";
import type { SignUpInput } from "./schemas";

const MINUTE = 60_000;
/** Failed sign-ins allowed per e-mail and per IP address in 15 minutes. */
export const SIGNIN_LIMITS = { perEmail: 8, perIp: 40, windowMs: 15 * MINUTE };
/** Sign-in links valid for 15 minutes. */
export const LOGIN_LINK_TTL_MS = 15 * MINUTE;

export const RATE_LIMIT_MESSAGE = "Too many sign-in attempts. Wait 15 minutes and try again, or use a sign-in link.";

function signInLimits(email: string, ip: string): Limit[] {
  return [
    { key: `signin:email:${email}`, max: SIGNIN_LIMITS.perEmail, windowMs: SIGNIN_LIMITS.windowMs },
    { key: `signin:ip:${ip}`, max: SIGNIN_LIMITS.perIp, windowMs: SIGNIN_LIMITS.windowMs },
  ];
}

export async function getUserByEmail(email: string): Promise<User | undefined> {
  const db = await read();
  return db.query.users.findFirst({ where: eq(users.email, email.trim().toLowerCase()) });
}

/** A URL slug from a firm name, made unique with a short suffix when taken. */
export async function uniqueSlug(name: string): Promise<string> {
  const base =
    name
      .normalize("NFKD")
      .replace(/[\u0300-\u036f]/g, "")
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-+|-+$/g, "")
      .slice(0, 40) || "workspace";
  const db = await read();
  let slug = base;
  for (let i = 0; i < 20; i++) {
    const taken = await db.query.workspaces.findFirst({ where: eq(workspaces.slug, slug), columns: { id: true } });
    if (!taken) return slug;
    slug = `${base}-${newToken(3).toLowerCase().replace(/[^a-z0-9]/g, "x")}`;
  }
  return `${base}-${newId().slice(0, 8)}`;
}

/** Create a workspace owned by `userId`, on a trial. Returns its slug. */
export async function createWorkspace(userId: string, name: string): Promise<{ id: string; slug: string }> {
  const slug = await uniqueSlug(name);
  const id = newId();
  const now = Date.now();
  await write(async (db) => {
    await db.batch([
      db.insert(workspaces).values({ id, name, slug, createdAt: now, ...trialFields(now) }),
      db.insert(memberships).values({ id: newId(), workspaceId: id, userId, role: "owner", createdAt: now }),
      auditInsert(db, { workspaceId: id, actorId: userId, action: "workspace.created", targetType: "workspace", targetId: id, data: { name } }),
    ]);
  });
  return { id, slug };
}

/** Sign up: the user and their first workspace, with them as owner. 409 if the e-mail is taken. */
export async function signUp(input: SignUpInput): Promise<{ user: User; workspaceSlug: string }> {
  if (await getUserByEmail(input.email)) {
    throw new AppError("conflict", "An account with that e-mail already exists. Sign in instead, or use a sign-in link.", {
      fields: { email: "is already registered" },
    });
  }
  const passwordHash = await hashPassword(input.password);
  const userId = newId();
  const wsId = newId();
  const slug = await uniqueSlug(input.workspaceName);
  const now = Date.now();
  try {
    await write(async (db) => {
      await db.batch([
        db.insert(users).values({ id: userId, email: input.email, name: input.name, passwordHash, createdAt: now }),
        db.insert(workspaces).values({ id: wsId, name: input.workspaceName, slug, createdAt: now, ...trialFields(now) }),
        db.insert(memberships).values({ id: newId(), workspaceId: wsId, userId, role: "owner", createdAt: now }),
        auditInsert(db, { workspaceId: wsId, actorId: userId, action: "workspace.created", targetType: "workspace", targetId: wsId, data: { name: input.workspaceName } }),
      ]);
    });
  } catch (err) {
    if (String(err).includes("UNIQUE")) throw new AppError("conflict", "An account with that e-mail already exists.", { fields: { email: "is already registered" } });
    throw err;
  }
  const user = (await getUserByEmail(input.email)) as User;
  return { user, workspaceSlug: slug };
}

/** Create a user without a workspace (joining by invitation). 409 if the e-mail is taken. */
export async function createUser(input: { name: string; email: string; password: string }): Promise<User> {
  if (await getUserByEmail(input.email)) throw new AppError("conflict", "An account with that e-mail already exists. Sign in to accept the invitation.", { fields: { email: "is already registered" } });
  const passwordHash = await hashPassword(input.password);
  const id = newId();
  await write((db) => db.insert(users).values({ id, email: input.email, name: input.name, passwordHash, createdAt: Date.now() }));
  return (await getUserByEmail(input.email)) as User;
}

/** Is this e-mail/IP pair currently blocked from signing in? Throws 429. */
export async function assertSignInAllowed(email: string, ip: string): Promise<void> {
  await assertNotLimited(signInLimits(email.trim().toLowerCase(), ip), RATE_LIMIT_MESSAGE);
}

/**
 * Check an e-mail and password. Returns the user, or null for an unknown e-mail or wrong
 * password (the same answer for both). Failures count against the rate limits; when a limit is
 * exhausted an AppError rate_limited is thrown before the password is even looked at.
 */
export async function checkPassword(email: string, password: string, ip: string): Promise<User | null> {
  const normalized = email.trim().toLowerCase();
  const limits = signInLimits(normalized, ip);
  await assertNotLimited(limits, RATE_LIMIT_MESSAGE);
  const user = await getUserByEmail(normalized);
  const ok = await verifyPassword(password, user?.passwordHash ?? dummyHash());
  if (!user || !user.passwordHash || !ok) {
    await hit(limits);
    return null;
  }
  return user;
}

/**
 * Send a single-use sign-in link if an account exists. Always resolves the same way, so the
 * answer does not reveal whether the e-mail is registered. Rate limited per e-mail and IP.
 */
export async function requestLoginLink(email: string, ip: string, next?: string): Promise<void> {
  const normalized = email.trim().toLowerCase();
  await consume(
    [
      { key: `link:email:${normalized}`, max: 5, windowMs: 15 * MINUTE },
      { key: `link:ip:${ip}`, max: 30, windowMs: 15 * MINUTE },
    ],
    "Too many sign-in links requested. Wait 15 minutes and try again.",
  );
  const user = await getUserByEmail(normalized);
  if (!user) return;
  const token = newToken();
  const now = Date.now();
  await write((db) =>
    db.insert(loginTokens).values({ id: newId(), email: normalized, tokenHash: sha256Hex(token), expiresAt: now + LOGIN_LINK_TTL_MS, createdAt: now }),
  );
  const safeNext = next && next.startsWith("/") && !next.startsWith("//") ? next : "";
  const link = `${appUrl()}/signin/link?token=${encodeURIComponent(token)}${safeNext ? `&next=${encodeURIComponent(safeNext)}` : ""}`;
  await sendMail({
    to: normalized,
    subject: "Your Loopwright sign-in link",
    text: `Hello ${user.name},\n\nUse this link to sign in to Loopwright. It works once and expires in 15 minutes:\n\n${link}\n\nIf you did not ask for it, ignore this message: nobody can sign in without the link.`,
  });
}

/** Consume a sign-in link token: the user, or null if unknown, used or expired. Single use. */
export async function consumeLoginToken(token: string): Promise<User | null> {
  const hash = sha256Hex(token);
  const now = Date.now();
  const email = await write(async (db) => {
    const rows = await db
      .update(loginTokens)
      .set({ usedAt: now })
      .where(and(eq(loginTokens.tokenHash, hash), isNull(loginTokens.usedAt), gt(loginTokens.expiresAt, now)))
      .returning({ email: loginTokens.email });
    return rows[0]?.email;
  });
  if (!email) return null;
  return (await getUserByEmail(email)) ?? null;
}

/** "Sign out everywhere": every existing session of the user stops working at once. */
export async function bumpSessionVersion(userId: string): Promise<void> {
  await write((db) => db.update(users).set({ sessionVersion: sql`${users.sessionVersion} + 1` }).where(eq(users.id, userId)));
}
