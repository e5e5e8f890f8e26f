/**
 * The permission matrix through the real route handlers: every workspace route × every role,
 * plus no session (401), a member of another workspace (404) and objects of another workspace
 * (404). The expected statuses are written out here from the roles table of the product design
 * (owner: everything; engineer: calculations, projects, parts; checker: engineer + check/approve;
 * client: shared projects and issued reports only), not derived from lib/auth/permissions.ts.
 *
 * Every exported handler of every app/api route file must appear here or in EXEMPT (with the
 * test that covers it): adding a route without adding it to the matrix fails this suite.
 */
import fs from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { call, makeWorld, setupDb, type World } from "./helpers";
import * as projectsRoute from "@/app/api/w/[slug]/projects/route";
import * as projectRoute from "@/app/api/w/[slug]/projects/[projectId]/route";
import * as accessRoute from "@/app/api/w/[slug]/projects/[projectId]/access/route";
import * as membersRoute from "@/app/api/w/[slug]/members/route";
import * as memberRoute from "@/app/api/w/[slug]/members/[membershipId]/route";
import * as invitationsRoute from "@/app/api/w/[slug]/invitations/route";
import * as invitationRoute from "@/app/api/w/[slug]/invitations/[invitationId]/route";
import * as teamRoute from "@/app/api/w/[slug]/team/route";
import * as auditRoute from "@/app/api/w/[slug]/audit/route";

type Actor = "owner" | "engineer" | "checker" | "client";
type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

export interface RouteCase {
  /** Route file relative to the repository root, and the exported method. */
  file: string;
  method: "GET" | "POST" | "PATCH" | "PUT" | "DELETE";
  handler: unknown;
  params: (w: World) => Record<string, string>;
  body?: (w: World) => unknown;
  query?: string | ((w: World) => string);
  /** Expected status per role. */
  expect: Record<Actor, number>;
  /** Params that point at an object of the OTHER workspace, used with this workspace's slug: 404. */
  foreignParams?: (w: World) => Record<string, string>;
}

const STAFF_OK = (ok: number): Record<Actor, number> => ({ owner: ok, engineer: ok, checker: ok, client: 403 });
const OWNER_ONLY = (ok: number): Record<Actor, number> => ({ owner: ok, engineer: 403, checker: 403, client: 403 });
const EVERYONE = (ok: number): Record<Actor, number> => ({ owner: ok, engineer: ok, checker: ok, client: ok });

const ws = (w: World) => ({ slug: w.slug });

export const ROUTES: RouteCase[] = [
  { file: "app/api/w/[slug]/projects/route.ts", method: "GET", handler: projectsRoute.GET, params: ws, expect: EVERYONE(200) },
  { file: "app/api/w/[slug]/projects/route.ts", method: "POST", handler: projectsRoute.POST, params: ws, body: () => ({ name: "New job" }), expect: STAFF_OK(201) },
  {
    file: "app/api/w/[slug]/projects/[projectId]/route.ts",
    method: "GET",
    handler: projectRoute.GET,
    params: (w) => ({ slug: w.slug, projectId: w.projectP }),
    expect: EVERYONE(200),
    foreignParams: (w) => ({ slug: w.slug, projectId: w.otherProject }),
  },
  {
    file: "app/api/w/[slug]/projects/[projectId]/route.ts",
    method: "PATCH",
    handler: projectRoute.PATCH,
    params: (w) => ({ slug: w.slug, projectId: w.projectP }),
    body: () => ({ name: "Renamed" }),
    expect: STAFF_OK(200),
    foreignParams: (w) => ({ slug: w.slug, projectId: w.otherProject }),
  },
  {
    file: "app/api/w/[slug]/projects/[projectId]/access/route.ts",
    method: "GET",
    handler: accessRoute.GET,
    params: (w) => ({ slug: w.slug, projectId: w.projectQ }),
    expect: OWNER_ONLY(200),
    foreignParams: (w) => ({ slug: w.slug, projectId: w.otherProject }),
  },
  {
    file: "app/api/w/[slug]/projects/[projectId]/access/route.ts",
    method: "POST",
    handler: accessRoute.POST,
    params: (w) => ({ slug: w.slug, projectId: w.projectQ }),
    body: (w) => ({ userId: w.client.id }),
    expect: OWNER_ONLY(200),
    foreignParams: (w) => ({ slug: w.slug, projectId: w.otherProject }),
  },
  {
    file: "app/api/w/[slug]/projects/[projectId]/access/route.ts",
    method: "DELETE",
    handler: accessRoute.DELETE,
    params: (w) => ({ slug: w.slug, projectId: w.projectP }),
    body: (w) => ({ userId: w.client.id }),
    expect: OWNER_ONLY(200),
    foreignParams: (w) => ({ slug: w.slug, projectId: w.otherProject }),
  },
  { file: "app/api/w/[slug]/members/route.ts", method: "GET", handler: membersRoute.GET, params: ws, expect: OWNER_ONLY(200) },
  {
    file: "app/api/w/[slug]/members/[membershipId]/route.ts",
    method: "PATCH",
    handler: memberRoute.PATCH,
    params: (w) => ({ slug: w.slug, membershipId: w.membership.engineer }),
    body: () => ({ role: "checker" }),
    expect: OWNER_ONLY(200),
    foreignParams: (w) => ({ slug: w.slug, membershipId: "membership-of-nobody" }),
  },
  {
    file: "app/api/w/[slug]/members/[membershipId]/route.ts",
    method: "DELETE",
    handler: memberRoute.DELETE,
    params: (w) => ({ slug: w.slug, membershipId: w.membership.engineer }),
    expect: OWNER_ONLY(200),
    foreignParams: (w) => ({ slug: w.slug, membershipId: "membership-of-nobody" }),
  },
  { file: "app/api/w/[slug]/invitations/route.ts", method: "GET", handler: invitationsRoute.GET, params: ws, expect: OWNER_ONLY(200) },
  {
    file: "app/api/w/[slug]/invitations/route.ts",
    method: "POST",
    handler: invitationsRoute.POST,
    params: ws,
    body: () => ({ email: `new-${Math.random().toString(36).slice(2)}@example.test`, role: "engineer" }),
    expect: OWNER_ONLY(201),
  },
  {
    file: "app/api/w/[slug]/invitations/[invitationId]/route.ts",
    method: "DELETE",
    handler: invitationRoute.DELETE,
    params: (w) => ({ slug: w.slug, invitationId: w.invitationId }),
    expect: OWNER_ONLY(200),
    foreignParams: (w) => ({ slug: w.slug, invitationId: "invitation-of-nobody" }),
  },
  { file: "app/api/w/[slug]/team/route.ts", method: "GET", handler: teamRoute.GET, params: ws, expect: STAFF_OK(200) },
  { file: "app/api/w/[slug]/audit/route.ts", method: "GET", handler: auditRoute.GET, params: ws, expect: OWNER_ONLY(200) },
];

/** Routes outside a workspace, and the test file that covers each. */
export const EXEMPT: Record<string, string> = {
  "app/api/auth/[...nextauth]/route.ts GET": "next-auth itself; tests/e2e/foundation.spec.ts",
  "app/api/auth/[...nextauth]/route.ts POST": "sign-in and its rate limit; tests/integration/auth.test.ts",
  "app/api/auth/link/route.ts POST": "public, sign-in links; tests/integration/auth.test.ts",
  "app/api/signup/route.ts POST": "public; tests/integration/auth.test.ts",
  "app/api/me/workspaces/route.ts GET": "any signed-in user, own workspaces only; tests/integration/auth.test.ts",
  "app/api/me/workspaces/route.ts POST": "any signed-in user; tests/integration/auth.test.ts",
  "app/api/me/sessions/route.ts DELETE": "any signed-in user, own sessions; tests/integration/auth.test.ts",
  "app/api/invitations/[token]/route.ts GET": "public by token; tests/integration/invitations.test.ts",
  "app/api/invitations/[token]/accept/route.ts POST": "by token; tests/integration/invitations.test.ts",
};

/** Other suites register their workspace routes here by adding files named *.matrix.ts. */
async function extraRoutes(): Promise<RouteCase[]> {
  const dir = path.join(process.cwd(), "tests", "integration", "matrix");
  if (!fs.existsSync(dir)) return [];
  const out: RouteCase[] = [];
  for (const f of fs.readdirSync(dir).filter((f) => f.endsWith(".matrix.ts")).sort()) {
    const mod = (await import(path.join(dir, f))) as { ROUTES: RouteCase[]; EXEMPT?: Record<string, string> };
    out.push(...mod.ROUTES);
    Object.assign(EXEMPT, mod.EXEMPT ?? {});
  }
  return out;
}

function routeFiles(dir = path.join(process.cwd(), "app", "api")): string[] {
  const out: string[] = [];
  for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) out.push(...routeFiles(p));
    else if (e.name === "route.ts") out.push(path.relative(process.cwd(), p));
  }
  return out;
}

function exportedMethods(file: string): string[] {
  const text = fs.readFileSync(file, "utf8");
  const re = /export\s+(?:const|async function|function)\s+(GET|POST|PUT|PATCH|DELETE)\b|export\s*\{[^}]*\b(GET|POST|PUT|PATCH|DELETE)\b/g;
  const found = new Set<string>();
  for (const m of text.matchAll(re)) found.add(m[1] ?? m[2]);
  return [...found];
}

let all: RouteCase[] = [];

beforeAll(async () => {
  await setupDb();
  all = [...ROUTES, ...(await extraRoutes())];
});

async function run(c: RouteCase, w: World, cookie: string | undefined, params = c.params(w)) {
  return call(c.handler as Handler, {
    method: c.method,
    params,
    body: c.body?.(w),
    cookie,
    url: `http://localhost:3999/${c.file}${typeof c.query === "function" ? c.query(w) : (c.query ?? "")}`,
  });
}

describe("every route handler is in the matrix", () => {
  it("lists each exported method of each app/api route file", () => {
    const covered = new Set(all.map((c) => `${c.file} ${c.method}`));
    const missing: string[] = [];
    for (const f of routeFiles()) for (const m of exportedMethods(f)) if (!covered.has(`${f} ${m}`) && !EXEMPT[`${f} ${m}`]) missing.push(`${f} ${m}`);
    expect(missing).toEqual([]);
  });
});

describe("role × action through the route handlers", () => {
  const actors: Actor[] = ["owner", "engineer", "checker", "client"];
  it("answers each role with the expected status", async () => {
    const failures: string[] = [];
    for (const c of all) {
      for (const a of actors) {
        const w = await makeWorld();
        const r = await run(c, w, w[a].cookie);
        if (r.status !== c.expect[a]) failures.push(`${c.method} ${c.file} as ${a}: ${r.status} (want ${c.expect[a]}) ${JSON.stringify(r.body).slice(0, 160)}`);
        if (r.status === 403 && (r.body.error as { code?: string })?.code !== "forbidden") failures.push(`${c.method} ${c.file} as ${a}: 403 without code forbidden`);
      }
    }
    expect(failures).toEqual([]);
  });

  it("answers 401 without a session", async () => {
    const w = await makeWorld();
    for (const c of all) {
      const r = await run(c, w, undefined);
      expect(r.status, `${c.method} ${c.file}`).toBe(401);
    }
  });

  it("answers 401 for a tampered or stale session cookie", async () => {
    const w = await makeWorld();
    const c = all[0];
    expect((await run(c, w, `${w.owner.cookie.slice(0, -4)}AAAA`)).status).toBe(401);
    const { sessionCookie } = await import("./helpers");
    expect((await run(c, w, await sessionCookie(w.owner.id, 99))).status).toBe(401);
  });

  it("answers 404 to a member of another workspace", async () => {
    const w = await makeWorld();
    for (const c of all) {
      const r = await run(c, w, w.outsider.cookie);
      expect(r.status, `${c.method} ${c.file}`).toBe(404);
    }
  });

  it("answers 404 for another workspace's objects, even to its owner", async () => {
    for (const c of all.filter((c) => c.foreignParams)) {
      const w = await makeWorld();
      const r = await run(c, w, w.owner.cookie, c.foreignParams!(w));
      expect(r.status, `${c.method} ${c.file}`).toBe(404);
    }
  });

  it("changes nothing when it refuses", async () => {
    const w = await makeWorld();
    const before = await run(ROUTES[0], w, w.owner.cookie);
    await run(ROUTES[1], w, w.client.cookie); // client may not create a project (403)
    await run(ROUTES[1], w, w.outsider.cookie); // outsider: 404
    const after = await run(ROUTES[0], w, w.owner.cookie);
    expect((after.body.projects as unknown[]).length).toBe((before.body.projects as unknown[]).length);
  });
});
