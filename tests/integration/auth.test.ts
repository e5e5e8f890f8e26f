/** Sign-up, password checks, rate limits, sign-in links and session revocation. */
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { call, makeUser, makeWorld, sessionCookie, setupDb } from "./helpers";
import * as signupRoute from "@/app/api/signup/route";
import * as linkRoute from "@/app/api/auth/link/route";
import * as nextauthRoute from "@/app/api/auth/[...nextauth]/route";
import * as meRoute from "@/app/api/me/workspaces/route";
import * as sessionsRoute from "@/app/api/me/sessions/route";
import * as projectsRoute from "@/app/api/w/[slug]/projects/route";
import * as memberRoute from "@/app/api/w/[slug]/members/[membershipId]/route";
import { bumpSessionVersion, checkPassword, consumeLoginToken, SIGNIN_LIMITS } from "@/lib/auth/accounts";
import { outbox } from "@/lib/mail";
import { read } from "@/db/write";
import { loginTokens, memberships, users, workspaces } from "@/db/schema";
import { AppError } from "@/lib/errors";

beforeAll(setupDb);

const uniq = () => Math.random().toString(36).slice(2, 8);

describe("sign-up", () => {
  it("creates the user and their first workspace with them as owner, on a trial", async () => {
    const email = `Ann.${uniq()}@Example.test`;
    const r = await call(signupRoute.POST, { body: { name: "Ann Example", email, password: "correct horse battery", workspaceName: "Example Analog Ltd" } });
    expect(r.status).toBe(201);
    const db = await read();
    const user = await db.query.users.findFirst({ where: eq(users.email, email.toLowerCase()) });
    expect(user?.passwordHash).toMatch(/^\$2[aby]\$10\$/);
    expect(user?.passwordHash).not.toContain("correct horse");
    const ws = await db.query.workspaces.findFirst({ where: eq(workspaces.slug, r.body.workspaceSlug as string) });
    expect(ws?.name).toBe("Example Analog Ltd");
    expect(ws?.subscriptionStatus).toBe("trialing");
    const m = await db.query.memberships.findFirst({ where: eq(memberships.userId, user!.id) });
    expect(m?.role).toBe("owner");
  });

  it("refuses a taken e-mail with 409 naming the field, and creates nothing", async () => {
    const email = `dup.${uniq()}@example.test`;
    const body = { name: "A", email, password: "long enough password", workspaceName: "Firm One" };
    expect((await call(signupRoute.POST, { body })).status).toBe(201);
    const again = await call(signupRoute.POST, { body: { ...body, workspaceName: "Firm Two" } });
    expect(again.status).toBe(409);
    expect((again.body.error as { fields: Record<string, string> }).fields.email).toMatch(/already registered/);
    const db = await read();
    expect(await db.query.workspaces.findFirst({ where: eq(workspaces.name, "Firm Two") })).toBeUndefined();
  });

  it("names each bad field with its rule (422) and creates nothing", async () => {
    const r = await call(signupRoute.POST, { body: { name: "", email: "not-an-email", password: "short", workspaceName: "x" } });
    expect(r.status).toBe(422);
    const fields = (r.body.error as { fields: Record<string, string> }).fields;
    expect(fields.name).toMatch(/required/i);
    expect(fields.email).toMatch(/valid address/);
    expect(fields.password).toMatch(/at least 10/);
    expect(fields.workspaceName).toMatch(/at least 2/);
  });

  it("answers 400 for a body that is not JSON", async () => {
    const r = await call(signupRoute.POST, { rawBody: "{nope", headers: { "content-type": "application/json" }, method: "POST" });
    expect(r.status).toBe(400);
    expect((r.body.error as { code: string }).code).toBe("bad_request");
  });
});

describe("password check and rate limit", () => {
  it("accepts the right password and refuses a wrong one or an unknown e-mail alike", async () => {
    const u = await makeUser("Pat", { password: "the right password" });
    expect((await checkPassword(u.email, "the right password", "10.0.0.1"))?.id).toBe(u.id);
    expect(await checkPassword(u.email, "the wrong password", "10.0.0.1")).toBeNull();
    expect(await checkPassword(`nobody-${uniq()}@example.test`, "whatever password", "10.0.0.1")).toBeNull();
  });

  it("blocks an e-mail after too many failures, even with the right password, with a clear 429", async () => {
    const u = await makeUser("Bruteforced", { password: "the right password" });
    const ip = `10.1.${Math.floor(Math.random() * 250)}.1`;
    for (let i = 0; i < SIGNIN_LIMITS.perEmail; i++) expect(await checkPassword(u.email, `wrong ${i}`, ip)).toBeNull();
    await expect(checkPassword(u.email, "the right password", ip)).rejects.toSatisfy((e: unknown) => e instanceof AppError && e.code === "rate_limited" && e.status === 429);

    // The real next-auth route answers 429 with our error shape, before next-auth runs.
    const form = new URLSearchParams({ email: u.email, password: "the right password", csrfToken: "x", json: "true" });
    const req = new Request("http://localhost:3999/api/auth/callback/password", {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded", "x-forwarded-for": ip },
      body: form,
    });
    const res = await nextauthRoute.POST(req, { params: Promise.resolve({ nextauth: ["callback", "password"] }) });
    expect(res.status).toBe(429);
    const body = (await res.json()) as { error: { code: string; message: string }; url: string };
    expect(body.error.code).toBe("rate_limited");
    expect(body.error.message).toMatch(/Too many sign-in attempts/);
    expect(new URL(body.url).searchParams.get("error")).toBe("rate_limited");
    expect(res.headers.get("retry-after")).toMatch(/^\d+$/);
  });

  it("blocks an IP address after too many failures across e-mails", async () => {
    const ip = `10.2.${Math.floor(Math.random() * 250)}.9`;
    for (let i = 0; i < SIGNIN_LIMITS.perIp; i++) await checkPassword(`spray-${i}-${uniq()}@example.test`, "guess guess", ip);
    const u = await makeUser("Innocent", { password: "the right password" });
    await expect(checkPassword(u.email, "the right password", ip)).rejects.toBeInstanceOf(AppError);
    // The same account from another address still works.
    expect((await checkPassword(u.email, "the right password", "10.3.0.1"))?.id).toBe(u.id);
  });
});

describe("sign-in links", () => {
  it("mails a single-use link for a known e-mail and nothing for an unknown one, with the same answer", async () => {
    const u = await makeUser("Linda");
    const before = outbox().length;
    const r1 = await call(linkRoute.POST, { body: { email: u.email }, headers: { "x-forwarded-for": "10.9.0.1" } });
    expect(r1.status).toBe(200);
    expect(outbox().length).toBe(before + 1);
    const mail = outbox().at(-1)!;
    expect(mail.to).toBe(u.email);
    const token = new URL(/https?:\/\/\S+/.exec(mail.text)![0]).searchParams.get("token")!;
    // Stored only as a hash.
    const db = await read();
    const rows = await db.select().from(loginTokens).where(eq(loginTokens.email, u.email));
    expect(rows[0].tokenHash).not.toBe(token);

    expect((await consumeLoginToken(token))?.id).toBe(u.id);
    expect(await consumeLoginToken(token)).toBeNull(); // single use

    const r2 = await call(linkRoute.POST, { body: { email: `ghost-${uniq()}@example.test` }, headers: { "x-forwarded-for": "10.9.0.2" } });
    expect(r2.status).toBe(200);
    expect(outbox().length).toBe(before + 1);
    expect(r2.body.message).toMatch(/If an account exists/);
  });

  it("refuses an expired link", async () => {
    const u = await makeUser("Late");
    await call(linkRoute.POST, { body: { email: u.email }, headers: { "x-forwarded-for": "10.9.0.3" } });
    const token = new URL(/https?:\/\/\S+/.exec(outbox().at(-1)!.text)![0]).searchParams.get("token")!;
    const { write } = await import("@/db/write");
    await write((db) => db.update(loginTokens).set({ expiresAt: Date.now() - 1 }).where(eq(loginTokens.email, u.email)));
    expect(await consumeLoginToken(token)).toBeNull();
  });

  it("rejects a malformed e-mail with 422", async () => {
    const r = await call(linkRoute.POST, { body: { email: "@@" } });
    expect(r.status).toBe(422);
    expect((r.body.error as { fields: Record<string, string> }).fields.email).toBeDefined();
  });
});

describe("sessions are re-checked on every request", () => {
  it("stops working at once after 'sign out everywhere'", async () => {
    const w = await makeWorld();
    expect((await call(projectsRoute.GET, { params: { slug: w.slug }, cookie: w.engineer.cookie })).status).toBe(200);
    await bumpSessionVersion(w.engineer.id);
    expect((await call(projectsRoute.GET, { params: { slug: w.slug }, cookie: w.engineer.cookie })).status).toBe(401);
    expect((await call(projectsRoute.GET, { params: { slug: w.slug }, cookie: await sessionCookie(w.engineer.id, 2) })).status).toBe(200);
  });

  it("DELETE /api/me/sessions signs the caller out everywhere", async () => {
    const w = await makeWorld();
    expect((await call(sessionsRoute.DELETE, { method: "DELETE" })).status).toBe(401);
    expect((await call(sessionsRoute.DELETE, { method: "DELETE", cookie: w.checker.cookie })).status).toBe(200);
    expect((await call(projectsRoute.GET, { params: { slug: w.slug }, cookie: w.checker.cookie })).status).toBe(401);
    expect((await call(projectsRoute.GET, { params: { slug: w.slug }, cookie: w.owner.cookie })).status).toBe(200);
  });

  it("a removed member loses access at once; a changed role applies at once", async () => {
    const w = await makeWorld();
    const create = () => call(projectsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { name: "Job" } });
    expect((await create()).status).toBe(201);
    expect((await call(memberRoute.PATCH, { params: { slug: w.slug, membershipId: w.membership.engineer }, cookie: w.owner.cookie, body: { role: "client" } })).status).toBe(200);
    expect((await create()).status).toBe(403);
    expect((await call(memberRoute.DELETE, { params: { slug: w.slug, membershipId: w.membership.engineer }, cookie: w.owner.cookie })).status).toBe(200);
    expect((await call(projectsRoute.GET, { params: { slug: w.slug }, cookie: w.engineer.cookie })).status).toBe(404);
  });
});

describe("/api/me/workspaces", () => {
  it("lists only the caller's workspaces and creates new ones owned by the caller", async () => {
    const w = await makeWorld();
    const mine = await call(meRoute.GET, { cookie: w.client.cookie });
    expect((mine.body.workspaces as Array<{ slug: string; role: string }>).map((x) => [x.slug, x.role])).toEqual([[w.slug, "client"]]);
    const made = await call(meRoute.POST, { cookie: w.client.cookie, body: { name: "Client's own firm" } });
    expect(made.status).toBe(201);
    const after = await call(meRoute.GET, { cookie: w.client.cookie });
    expect((after.body.workspaces as Array<{ role: string }>).map((x) => x.role).sort()).toEqual(["client", "owner"]);
    expect((await call(meRoute.POST, { cookie: w.client.cookie, body: { name: "" } })).status).toBe(422);
    expect((await call(meRoute.GET, {})).status).toBe(401);
  });
});
