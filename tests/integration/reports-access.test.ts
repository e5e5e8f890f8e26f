/**
 * Who sees which reports, through the route handlers: a client sees only issued reports of the
 * projects shared with them (never a draft, never another project's or workspace's report); an
 * engineer of another workspace sees nothing of this one. Everything refused answers 404.
 */
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { write } from "@/db/write";
import { calculationHistory, calculations } from "@/db/schema";
import { newId } from "@/lib/ids";
import { call, draftCalculation, makeWorld, setupDb, type TestUser, type World } from "./helpers";
import { approveAndIssue, download } from "./reports-support";
import * as reportsRoute from "@/app/api/w/[slug]/reports/route";
import * as reportRoute from "@/app/api/w/[slug]/reports/[reportId]/route";

type Handler<P> = (req: Request, ctx: { params: Promise<P> }) => Promise<Response>;

beforeAll(async () => {
  await setupDb();
});

async function list(w: World, who: TestUser, query: string, slug = w.slug) {
  return call(reportsRoute.GET as Handler<{ slug: string }>, { params: { slug }, cookie: who.cookie, url: `http://localhost:3999/api/w/${slug}/reports${query}` });
}

async function getOne(w: World, who: TestUser, reportId: string, slug = w.slug) {
  return call(reportRoute.GET as Handler<{ slug: string; reportId: string }>, { params: { slug, reportId }, cookie: who.cookie });
}

/** A draft calculation in `projectId`, prepared by the engineer. */
async function addCalc(w: World, projectId: string, number: string): Promise<string> {
  const id = newId();
  const row = draftCalculation({ id, workspaceId: w.workspaceId, projectId, preparedBy: w.engineer.id, number, now: Date.now() });
  await write((db) =>
    db.batch([
      db.insert(calculations).values(row),
      db.insert(calculationHistory).values({ id: newId(), workspaceId: w.workspaceId, calculationId: id, revision: "A", version: 1, event: "create", status: "draft", title: row.title, inputs: row.inputs, results: row.results, engineVersion: row.engineVersion, actorId: w.engineer.id, at: Date.now() }),
    ]),
  );
  return id;
}

describe("the client portal", () => {
  let w: World;
  let inP: { id: string };
  let inQ: { id: string };
  let draftInP: string;

  beforeAll(async () => {
    w = await makeWorld();
    inP = await approveAndIssue(w); // project P: shared with the client
    const qCalc = await addCalc(w, w.projectQ, "C-101");
    inQ = await approveAndIssue(w, qCalc); // project Q: not shared
    draftInP = await addCalc(w, w.projectP, "C-002"); // never issued
  }, 60_000);

  it("lists only the issued reports of a shared project, and downloads them", async () => {
    const r = await list(w, w.client, `?projectId=${w.projectP}`);
    expect(r.status).toBe(200);
    const reports = r.body.reports as Array<{ id: string; number: string; revision: string }>;
    expect(reports.map((x) => x.id)).toEqual([inP.id]);
    // Nothing about calculations, drafts or attachments in what a client gets.
    expect(JSON.stringify(r.body)).not.toContain(draftInP);
    expect(JSON.stringify(r.body)).not.toContain("inputs");
    const d = await download(w, w.client, inP.id);
    expect(d.status).toBe(200);
    expect(d.headers.get("content-type")).toBe("application/pdf");
    expect((await getOne(w, w.client, inP.id)).status).toBe(200);
  });

  it("answers 404 for a project not shared with the client, and for its reports", async () => {
    expect((await list(w, w.client, `?projectId=${w.projectQ}`)).status).toBe(404);
    expect((await getOne(w, w.client, inQ.id)).status).toBe(404);
    const d = await download(w, w.client, inQ.id);
    expect(d.status).toBe(404);
    expect(d.bytes.toString("utf8")).not.toContain("%PDF");
  });

  it("never shows a client an unissued calculation (404, as if it did not exist)", async () => {
    const r = await list(w, w.client, `?calculationId=${draftInP}`);
    expect(r.status).toBe(404);
    // Its issued sibling in the same project is listed.
    const ok = await list(w, w.client, `?calculationId=${w.calcId}`);
    expect(ok.status).toBe(200);
    expect((ok.body.reports as unknown[]).length).toBe(1);
    // Staff see the (empty) list of the draft.
    const staff = await list(w, w.engineer, `?calculationId=${draftInP}`);
    expect(staff.status).toBe(200);
    expect(staff.body.reports).toEqual([]);
  });

  it("staff see every project's reports", async () => {
    const r = await list(w, w.engineer, `?projectId=${w.projectQ}`);
    expect(r.status).toBe(200);
    expect((r.body.reports as Array<{ id: string }>).map((x) => x.id)).toEqual([inQ.id]);
    expect((await download(w, w.checker, inQ.id)).status).toBe(200);
  });

  it("an engineer of another workspace sees nothing: 404 with this workspace's slug and with their own", async () => {
    const outsider = w.outsider;
    expect((await list(w, outsider, `?projectId=${w.projectP}`)).status).toBe(404);
    expect((await getOne(w, outsider, inP.id)).status).toBe(404);
    expect((await download(w, outsider, inP.id)).status).toBe(404);
    // Through their own workspace, this workspace's objects do not exist either.
    expect((await list(w, outsider, `?projectId=${w.projectP}`, w.otherSlug)).status).toBe(404);
    expect((await list(w, outsider, `?calculationId=${w.calcId}`, w.otherSlug)).status).toBe(404);
    expect((await getOne(w, outsider, inP.id, w.otherSlug)).status).toBe(404);
    expect((await download(w, outsider, inP.id, w.otherSlug)).status).toBe(404);
  });

  it("a client whose access is removed loses the reports at once", async () => {
    const w2 = await makeWorld();
    const rep = await approveAndIssue(w2);
    expect((await download(w2, w2.client, rep.id)).status).toBe(200);
    const { projectAccess } = await import("@/db/schema");
    await write((db) => db.delete(projectAccess).where(eq(projectAccess.userId, w2.client.id)));
    expect((await download(w2, w2.client, rep.id)).status).toBe(404);
    expect((await list(w2, w2.client, `?projectId=${w2.projectP}`)).status).toBe(404);
  }, 30_000);

  it("needs exactly one of projectId or calculationId (422)", async () => {
    const r = await list(w, w.engineer, "");
    expect(r.status).toBe(422);
    expect((r.body.error as { fields: Record<string, string> }).fields.projectId).toContain("exactly one");
  });
});

describe("a customer never loses data by not paying", () => {
  it("after cancellation the workspace is read-only, yet calculations and issued reports stay readable and downloadable", async () => {
    const w = await makeWorld();
    const rep = await approveAndIssue(w);
    const { workspaces } = await import("@/db/schema");
    await write((db) => db.update(workspaces).set({ subscriptionStatus: "canceled", packs: [] }).where(eq(workspaces.id, w.workspaceId)));
    const calcRoute = await import("@/app/api/w/[slug]/calculations/[calcId]/route");
    const projectsRoute = await import("@/app/api/w/[slug]/projects/route");
    // Reading works for staff and the client…
    expect((await call(calcRoute.GET, { params: { slug: w.slug, calcId: w.calcId }, cookie: w.engineer.cookie })).status).toBe(200);
    for (const who of [w.owner, w.client]) {
      const d = await download(w, who, rep.id);
      expect(d.status).toBe(200);
      expect(d.bytes.subarray(0, 5).toString()).toBe("%PDF-");
      expect((await list(w, who, `?projectId=${w.projectP}`)).status).toBe(200);
    }
    // …changes are refused with a clear read-only message.
    const create = await call(projectsRoute.POST, { params: { slug: w.slug }, cookie: w.owner.cookie, body: { name: "New job" } });
    expect(create.status).toBe(403);
    expect((create.body.error as { code: string; message: string }).code).toBe("read_only");
    expect((create.body.error as { message: string }).message).toMatch(/readable and downloadable/);
  });
});
