/** Invitations, members and client project scoping through the route handlers. */
import { beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { call, makeUser, makeWorld, setupDb, type World } from "./helpers";
import * as invitationsRoute from "@/app/api/w/[slug]/invitations/route";
import * as invitationRoute from "@/app/api/w/[slug]/invitations/[invitationId]/route";
import * as lookupRoute from "@/app/api/invitations/[token]/route";
import * as acceptRoute from "@/app/api/invitations/[token]/accept/route";
import * as membersRoute from "@/app/api/w/[slug]/members/route";
import * as memberRoute from "@/app/api/w/[slug]/members/[membershipId]/route";
import * as projectsRoute from "@/app/api/w/[slug]/projects/route";
import * as projectRoute from "@/app/api/w/[slug]/projects/[projectId]/route";
import { outbox } from "@/lib/mail";
import { read, write } from "@/db/write";
import { invitations, memberships, users } from "@/db/schema";
import { sha256Hex } from "@/lib/ids";

beforeAll(setupDb);

const uniq = () => Math.random().toString(36).slice(2, 8);
const fields = (b: Record<string, unknown>) => (b.error as { fields?: Record<string, string> }).fields ?? {};

async function invite(w: World, body: Record<string, unknown>) {
  return call(invitationsRoute.POST, { params: { slug: w.slug }, cookie: w.owner.cookie, body });
}
function tokenFromLastMail(): string {
  const link = /https?:\/\/\S+\/invite\/(\S+)/.exec(outbox().at(-1)!.text)!;
  return link[1];
}
async function pendingCount(w: World): Promise<number> {
  const r = await call(invitationsRoute.GET, { params: { slug: w.slug }, cookie: w.owner.cookie });
  return (r.body.invitations as unknown[]).length;
}

describe("creating invitations", () => {
  it("mails a link whose token is stored only as its SHA-256, valid 7 days", async () => {
    const w = await makeWorld();
    const email = `new-${uniq()}@example.test`;
    const r = await invite(w, { email, role: "engineer" });
    expect(r.status).toBe(201);
    expect(r.body.mailSent).toBe(true);
    const mail = outbox().at(-1)!;
    expect(mail.to).toBe(email);
    expect(mail.subject).toMatch(/invited you to Test Firm A/);
    const token = tokenFromLastMail();
    expect(r.body.link).toContain(token);
    const db = await read();
    const row = await db.query.invitations.findFirst({ where: eq(invitations.email, email) });
    expect(row?.tokenHash).toBe(sha256Hex(token));
    expect(JSON.stringify(row)).not.toContain(token);
    const days = (row!.expiresAt - row!.createdAt) / 86_400_000;
    expect(days).toBe(7);
  });

  it("refuses a malformed e-mail, a role outside the set, a duplicate and an existing member, changing nothing", async () => {
    const w = await makeWorld();
    const n0 = await pendingCount(w);
    const bad = await invite(w, { email: "not an e-mail", role: "engineer" });
    expect(bad.status).toBe(422);
    expect(fields(bad.body).email).toMatch(/valid address/);
    const role = await invite(w, { email: `x-${uniq()}@example.test`, role: "admin" });
    expect(role.status).toBe(422);
    expect(fields(role.body).role).toMatch(/owner, engineer, checker, client/);
    const email = `twice-${uniq()}@example.test`;
    expect((await invite(w, { email, role: "checker" })).status).toBe(201);
    const dup = await invite(w, { email, role: "checker" });
    expect(dup.status).toBe(409);
    expect(fields(dup.body).email).toMatch(/pending invitation/);
    const member = await invite(w, { email: w.engineer.email, role: "checker" });
    expect(member.status).toBe(409);
    expect(fields(member.body).email).toMatch(/already a member/);
    expect(await pendingCount(w)).toBe(n0 + 1);
  });

  it("requires a client invitation to name projects of this workspace", async () => {
    const w = await makeWorld();
    const none = await invite(w, { email: `c-${uniq()}@example.test`, role: "client" });
    expect(none.status).toBe(422);
    expect(fields(none.body).projectIds).toMatch(/at least one project/);
    const foreign = await invite(w, { email: `c-${uniq()}@example.test`, role: "client", projectIds: [w.otherProject] });
    expect(foreign.status).toBe(422);
    expect(fields(foreign.body).projectIds).toMatch(/unknown project/);
  });
});

describe("accepting invitations", () => {
  it("lets an existing user with the invited e-mail join once", async () => {
    const w = await makeWorld();
    const u = await makeUser("Joiner");
    await invite(w, { email: u.email, role: "checker" });
    const token = tokenFromLastMail();
    const look = await call(lookupRoute.GET, { params: { token } });
    expect(look.body.invitation).toMatchObject({ status: "valid", role: "checker", workspaceName: "Test Firm A", accountExists: true });
    const ok = await call(acceptRoute.POST, { params: { token }, cookie: u.cookie });
    expect(ok.status).toBe(200);
    expect(ok.body.workspaceSlug).toBe(w.slug);
    const db = await read();
    const m = await db.query.memberships.findFirst({ where: and(eq(memberships.userId, u.id), eq(memberships.workspaceId, w.workspaceId)) });
    expect(m?.role).toBe("checker");
    const again = await call(acceptRoute.POST, { params: { token }, cookie: u.cookie });
    expect(again.status).toBe(409);
    expect((again.body.error as { message: string }).message).toMatch(/already been used/);
    expect((await call(lookupRoute.GET, { params: { token } })).body.invitation).toMatchObject({ status: "used" });
  });

  it("creates an account for a new invitee, or refuses bad fields without creating anything", async () => {
    const w = await makeWorld();
    const email = `fresh-${uniq()}@example.test`;
    await invite(w, { email, role: "engineer" });
    const token = tokenFromLastMail();
    const weak = await call(acceptRoute.POST, { params: { token }, body: { name: "Fresh", password: "short" } });
    expect(weak.status).toBe(422);
    expect(fields(weak.body).password).toMatch(/at least 10/);
    const db = await read();
    expect(await db.query.users.findFirst({ where: eq(users.email, email) })).toBeUndefined();
    const ok = await call(acceptRoute.POST, { params: { token }, body: { name: "Fresh Person", password: "a fine password" } });
    expect(ok.status).toBe(201);
    const u = await db.query.users.findFirst({ where: eq(users.email, email) });
    expect(u?.name).toBe("Fresh Person");
  });

  it("refuses a revoked, an expired, an unknown and a wrong-account invitation", async () => {
    const w = await makeWorld();
    const u = await makeUser("Someone");
    await invite(w, { email: u.email, role: "engineer" });
    const token = tokenFromLastMail();
    const list = await call(invitationsRoute.GET, { params: { slug: w.slug }, cookie: w.owner.cookie });
    const inv = (list.body.invitations as Array<{ id: string; email: string }>).find((i) => i.email === u.email)!;

    const other = await makeUser("Other");
    const wrong = await call(acceptRoute.POST, { params: { token }, cookie: other.cookie });
    expect(wrong.status).toBe(403);
    expect((wrong.body.error as { message: string }).message).toContain(u.email);

    expect((await call(invitationRoute.DELETE, { params: { slug: w.slug, invitationId: inv.id }, cookie: w.owner.cookie })).status).toBe(200);
    const revoked = await call(acceptRoute.POST, { params: { token }, cookie: u.cookie });
    expect(revoked.status).toBe(409);
    expect((revoked.body.error as { message: string }).message).toMatch(/withdrawn/);
    expect((await call(invitationRoute.DELETE, { params: { slug: w.slug, invitationId: inv.id }, cookie: w.owner.cookie })).status).toBe(404);

    await invite(w, { email: u.email, role: "engineer" });
    const token2 = tokenFromLastMail();
    await write((db) => db.update(invitations).set({ expiresAt: Date.now() - 1000 }).where(eq(invitations.tokenHash, sha256Hex(token2))));
    const expired = await call(acceptRoute.POST, { params: { token: token2 }, cookie: u.cookie });
    expect(expired.status).toBe(409);
    expect((expired.body.error as { message: string }).message).toMatch(/expired/);

    expect((await call(acceptRoute.POST, { params: { token: "no-such-token" }, cookie: u.cookie })).status).toBe(404);
    expect((await call(lookupRoute.GET, { params: { token: "no-such-token" } })).status).toBe(404);
    const db = await read();
    expect(await db.query.memberships.findFirst({ where: and(eq(memberships.userId, u.id), eq(memberships.workspaceId, w.workspaceId)) })).toBeUndefined();
  });

  it("a client sees exactly the projects they were invited to", async () => {
    const w = await makeWorld();
    const email = `client-${uniq()}@example.test`;
    await invite(w, { email, role: "client", projectIds: [w.projectQ] });
    const token = tokenFromLastMail();
    await call(acceptRoute.POST, { params: { token }, body: { name: "New Client", password: "client password" } });
    const db = await read();
    const u = (await db.query.users.findFirst({ where: eq(users.email, email) }))!;
    const { sessionCookie } = await import("./helpers");
    const cookie = await sessionCookie(u.id);
    const list = await call(projectsRoute.GET, { params: { slug: w.slug }, cookie });
    expect((list.body.projects as Array<{ name: string }>).map((p) => p.name)).toEqual(["Project Q"]);
    expect((await call(projectRoute.GET, { params: { slug: w.slug, projectId: w.projectP }, cookie })).status).toBe(404);
    expect((await call(projectRoute.GET, { params: { slug: w.slug, projectId: w.projectQ }, cookie })).status).toBe(200);
  });
});

describe("members", () => {
  it("the last owner can be neither demoted nor removed; with a second owner both work", async () => {
    const w = await makeWorld();
    const demote = await call(memberRoute.PATCH, { params: { slug: w.slug, membershipId: w.membership.owner }, cookie: w.owner.cookie, body: { role: "engineer" } });
    expect(demote.status).toBe(409);
    expect((demote.body.error as { message: string }).message).toMatch(/only owner/);
    const remove = await call(memberRoute.DELETE, { params: { slug: w.slug, membershipId: w.membership.owner }, cookie: w.owner.cookie });
    expect(remove.status).toBe(409);
    expect((await call(memberRoute.PATCH, { params: { slug: w.slug, membershipId: w.membership.checker }, cookie: w.owner.cookie, body: { role: "owner" } })).status).toBe(200);
    expect((await call(memberRoute.PATCH, { params: { slug: w.slug, membershipId: w.membership.owner }, cookie: w.owner.cookie, body: { role: "engineer" } })).status).toBe(200);
  });

  it("refuses a role outside the set with 422 and changes nothing", async () => {
    const w = await makeWorld();
    const r = await call(memberRoute.PATCH, { params: { slug: w.slug, membershipId: w.membership.engineer }, cookie: w.owner.cookie, body: { role: "superuser" } });
    expect(r.status).toBe(422);
    const list = await call(membersRoute.GET, { params: { slug: w.slug }, cookie: w.owner.cookie });
    expect((list.body.members as Array<{ userId: string; role: string }>).find((m) => m.userId === w.engineer.id)?.role).toBe("engineer");
  });

  it("refuses a seat invitation beyond the paid seats with a clear message; clients stay free", async () => {
    // Paid workspace with 5 seats: owner, engineer and checker use 3, the world's pending
    // engineer invitation holds a 4th (pending seat invitations count).
    const w = await makeWorld({ status: "active", seatsPaid: 5 });
    expect((await invite(w, { email: `fourth-${uniq()}@example.test`, role: "engineer" })).status).toBe(201);
    const fifth = await invite(w, { email: `fifth-${uniq()}@example.test`, role: "checker" });
    expect(fifth.status).toBe(409);
    expect((fifth.body.error as { code: string; message: string }).code).toBe("seat_limit");
    expect((fifth.body.error as { message: string }).message).toMatch(/All 5 paid seats are in use.*2 pending invitations.*Add seats/);
    expect((await invite(w, { email: `free-${uniq()}@example.test`, role: "client", projectIds: [w.projectP] })).status).toBe(201);
  });
});
