/**
 * Integration-test helpers: a migrated temporary SQLite file, worlds of users and workspaces
 * inserted directly, real next-auth session cookies, and route handlers called in-process with
 * real Request objects.
 */
import { encode } from "next-auth/jwt";
import { runMigrations } from "@/db/migrate";
import { write } from "@/db/write";
import { calculationHistory, calculations, invitations, memberships, projectAccess, projects, users, workspaces, type Role } from "@/db/schema";
import { getCalcType } from "@/lib/calc/registry";
import { runCompute } from "@/lib/calculations/compute";
import type { RawInputs } from "@/lib/calc/core/types";
import { newId, newToken, sha256Hex } from "@/lib/ids";
import { trialFields } from "@/lib/billing/trial";
import { hashPassword } from "@/lib/auth/password";

let migrated = false;
/** Apply migrations once per test file (each file has its own database, see tests/setup-env.ts). */
export async function setupDb(): Promise<void> {
  if (migrated) return;
  await runMigrations();
  migrated = true;
}

export interface TestUser {
  id: string;
  email: string;
  name: string;
  cookie: string;
}

/** A next-auth session cookie for a user id (the same JWE the app issues). */
export async function sessionCookie(userId: string, sessionVersion = 1): Promise<string> {
  const token = await encode({ token: { uid: userId, sv: sessionVersion, sub: userId }, secret: process.env.NEXTAUTH_SECRET as string });
  return `next-auth.session-token=${token}`;
}

let counter = 0;
function unique(): string {
  counter += 1;
  return `${Date.now().toString(36)}${counter}${Math.random().toString(36).slice(2, 6)}`;
}

export async function makeUser(name: string, opts: { password?: string } = {}): Promise<TestUser> {
  const id = newId();
  const email = `${name.toLowerCase().replace(/[^a-z]/g, "")}-${unique()}@example.test`;
  const passwordHash = opts.password ? await hashPassword(opts.password) : null;
  await write((db) => db.insert(users).values({ id, email, name, passwordHash, createdAt: Date.now() }));
  return { id, email, name, cookie: await sessionCookie(id) };
}

export interface World {
  slug: string;
  workspaceId: string;
  owner: TestUser;
  engineer: TestUser;
  checker: TestUser;
  client: TestUser;
  /** Owner of another workspace: must see 404 for everything of this one. */
  outsider: TestUser;
  otherSlug: string;
  otherWorkspaceId: string;
  /** A project shared with the client. */
  projectP: string;
  /** A project not shared with the client. */
  projectQ: string;
  /** A project of the other workspace. */
  otherProject: string;
  membership: Record<"owner" | "engineer" | "checker" | "client", string>;
  /** A pending invitation of this workspace and its raw token. */
  invitationId: string;
  invitationToken: string;
  /** A draft calculation (filter.lowpass, defaults) in project P, prepared by the engineer, version 1. */
  calcId: string;
  /** Its one history entry ("create"). */
  historyId: string;
  /** A calculation of the other workspace. */
  otherCalcId: string;
}

/** Row values for a draft calculation of `typeId` with the type's defaults, computed. */
export function draftCalculation(opts: { id: string; workspaceId: string; projectId: string; preparedBy: string; number: string; typeId?: string; now: number }) {
  const type = getCalcType(opts.typeId ?? "filter.lowpass")!;
  const inputs = structuredClone(type.defaults) as Record<string, unknown>;
  const r = runCompute(type, inputs as RawInputs);
  return {
    id: opts.id,
    workspaceId: opts.workspaceId,
    projectId: opts.projectId,
    number: opts.number,
    title: `${type.title} test`,
    typeId: type.id,
    engineVersion: type.version,
    status: "draft" as const,
    revision: "A",
    inputs,
    results: r.ok ? (r.output as unknown as Record<string, unknown>) : null,
    checkSummary: r.ok ? r.summary : null,
    preparedBy: opts.preparedBy,
    version: 1,
    createdAt: opts.now,
    updatedAt: opts.now,
    updatedBy: opts.preparedBy,
  };
}

/** Two workspaces: A with one member per role and projects P (shared with the client) and Q; B with an outsider owner. */
export async function makeWorld(opts: { status?: "trialing" | "active" | "canceled" | "past_due"; seatsPaid?: number } = {}): Promise<World> {
  const [owner, engineer, checker, client, outsider] = await Promise.all([
    makeUser("Owner"),
    makeUser("Engineer"),
    makeUser("Checker"),
    makeUser("Client"),
    makeUser("Outsider"),
  ]);
  const now = Date.now();
  const wsA = newId();
  const wsB = newId();
  const slug = `ws-${unique()}`;
  const otherSlug = `other-${unique()}`;
  const projectP = newId();
  const projectQ = newId();
  const otherProject = newId();
  const membership = { owner: newId(), engineer: newId(), checker: newId(), client: newId() };
  const invitationId = newId();
  const invitationToken = newToken();
  const calcId = newId();
  const historyId = newId();
  const otherCalcId = newId();
  const calcRow = draftCalculation({ id: calcId, workspaceId: wsA, projectId: projectP, preparedBy: engineer.id, number: "C-001", now });
  const otherCalcRow = draftCalculation({ id: otherCalcId, workspaceId: wsB, projectId: otherProject, preparedBy: outsider.id, number: "C-001", now });
  const billing =
    opts.status && opts.status !== "trialing"
      ? { subscriptionStatus: opts.status, packs: ["amplifier", "filter", "reference"], seatsPaid: opts.seatsPaid ?? 10, pastDueSince: opts.status === "past_due" ? now : null }
      : { ...trialFields(now), seatsPaid: opts.seatsPaid ?? 0 };
  const roles: Array<[keyof typeof membership, TestUser, Role]> = [
    ["owner", owner, "owner"],
    ["engineer", engineer, "engineer"],
    ["checker", checker, "checker"],
    ["client", client, "client"],
  ];
  await write(async (db) => {
    await db.batch([
      db.insert(workspaces).values({ id: wsA, name: "Test Firm A", slug, createdAt: now, ...billing }),
      db.insert(workspaces).values({ id: wsB, name: "Test Firm B", slug: otherSlug, createdAt: now, ...trialFields(now) }),
      ...roles.map(([k, u, role]) => db.insert(memberships).values({ id: membership[k], workspaceId: wsA, userId: u.id, role, createdAt: now })),
      db.insert(memberships).values({ id: newId(), workspaceId: wsB, userId: outsider.id, role: "owner", createdAt: now }),
      db.insert(projects).values({ id: projectP, workspaceId: wsA, name: "Project P", createdBy: owner.id, createdAt: now, updatedAt: now }),
      db.insert(projects).values({ id: projectQ, workspaceId: wsA, name: "Project Q", createdBy: owner.id, createdAt: now, updatedAt: now }),
      db.insert(projects).values({ id: otherProject, workspaceId: wsB, name: "Other firm's project", createdBy: outsider.id, createdAt: now, updatedAt: now }),
      db.insert(projectAccess).values({ projectId: projectP, userId: client.id, workspaceId: wsA, createdAt: now }),
      db.insert(invitations).values({
        id: invitationId,
        workspaceId: wsA,
        email: `invitee-${unique()}@example.test`,
        role: "engineer",
        tokenHash: sha256Hex(invitationToken),
        invitedBy: owner.id,
        createdAt: now,
        expiresAt: now + 7 * 24 * 3600 * 1000,
      }),
      db.insert(calculations).values(calcRow),
      db.insert(calculationHistory).values({
        id: historyId,
        workspaceId: wsA,
        calculationId: calcId,
        revision: "A",
        version: 1,
        event: "create",
        status: "draft",
        title: calcRow.title,
        inputs: calcRow.inputs,
        results: calcRow.results,
        engineVersion: calcRow.engineVersion,
        actorId: engineer.id,
        at: now,
      }),
      db.insert(calculations).values(otherCalcRow),
    ]);
  });
  return { slug, workspaceId: wsA, owner, engineer, checker, client, outsider, otherSlug, otherWorkspaceId: wsB, projectP, projectQ, otherProject, membership, invitationId, invitationToken, calcId, historyId, otherCalcId };
}

type Handler<P> = (req: Request, ctx: { params: Promise<P> }) => Promise<Response>;

/** Call a route handler in-process. Returns the status and the parsed JSON body. */
export async function call<P extends object>(
  handler: Handler<P>,
  opts: { method?: string; params?: P; body?: unknown; rawBody?: BodyInit; cookie?: string; headers?: Record<string, string>; url?: string },
): Promise<{ status: number; body: Record<string, unknown>; headers: Headers }> {
  const headers: Record<string, string> = { ...(opts.headers ?? {}) };
  if (opts.cookie) headers.cookie = opts.cookie;
  let body: BodyInit | undefined = opts.rawBody;
  if (opts.body !== undefined) {
    headers["content-type"] = "application/json";
    body = JSON.stringify(opts.body);
  }
  const req = new Request(opts.url ?? "http://localhost:3999/api/test", { method: opts.method ?? (body ? "POST" : "GET"), headers, body });
  const res = await handler(req, { params: Promise.resolve((opts.params ?? {}) as P) });
  const text = await res.text();
  let parsed: Record<string, unknown> = {};
  try {
    parsed = text ? JSON.parse(text) : {};
  } catch {
    parsed = { _text: text };
  }
  return { status: res.status, body: parsed, headers: res.headers };
}
