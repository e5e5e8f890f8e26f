/**
 * Calculations through the route handlers: drafts, autosave with optimistic concurrency, the
 * check-and-approve state machine per role, immutability of issued revisions, the register,
 * compare, pack locks, and many concurrent autosaves on one SQLite file.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { call, draftCalculation, makeWorld, setupDb, type World } from "./helpers";
import * as listRoute from "@/app/api/w/[slug]/projects/[projectId]/calculations/route";
import * as calcRoute from "@/app/api/w/[slug]/calculations/[calcId]/route";
import * as transitionsRoute from "@/app/api/w/[slug]/calculations/[calcId]/transitions/route";
import * as historyRoute from "@/app/api/w/[slug]/calculations/[calcId]/history/route";
import * as compareRoute from "@/app/api/w/[slug]/calculations/[calcId]/compare/route";
import * as commentsRoute from "@/app/api/w/[slug]/calculations/[calcId]/comments/route";
import * as computeRoute from "@/app/api/w/[slug]/compute/route";
import { read, write } from "@/db/write";
import { calculations, reports, workspaces } from "@/db/schema";
import { outbox } from "@/lib/mail";
import { newId } from "@/lib/ids";
import { nextRevision } from "@/lib/calculations/workflow";

beforeAll(setupDb);

type Calc = { id: string; status: string; version: number; revision: string; title: string; results: unknown; inputs: Record<string, unknown> };
const calcOf = (r: { body: Record<string, unknown> }) => r.body.calculation as Calc;
const err = (r: { body: Record<string, unknown> }) => r.body.error as { code: string; message: string; fields?: Record<string, string> };

function api(w: World, calcId = w.calcId) {
  const p = { slug: w.slug, calcId };
  return {
    get: (cookie: string) => call(calcRoute.GET, { params: p, cookie }),
    save: (cookie: string, body: Record<string, unknown>) => call(calcRoute.PATCH, { method: "PATCH", params: p, cookie, body }),
    go: (cookie: string, body: Record<string, unknown>) => call(transitionsRoute.POST, { params: p, cookie, body }),
  };
}

describe("creating and saving drafts", () => {
  it("creates a draft with the type's defaults computed and the next number", async () => {
    const w = await makeWorld();
    const r = await call(listRoute.POST, { params: { slug: w.slug, projectId: w.projectP }, cookie: w.engineer.cookie, body: { typeId: "filter.lowpass", title: "Anti-alias filter" } });
    expect(r.status).toBe(201);
    const c = calcOf(r) as Calc & { number: string; checkSummary: unknown };
    expect(c.number).toBe("C-002"); // the world already has C-001
    expect(c.status).toBe("draft");
    expect(c.revision).toBe("A");
    expect(c.results).not.toBeNull();
    const bad = await call(listRoute.POST, { params: { slug: w.slug, projectId: w.projectP }, cookie: w.engineer.cookie, body: { typeId: "no.such-type", title: "x" } });
    expect(bad.status).toBe(422);
    expect(err(bad).fields?.typeId).toMatch(/not a calculation type/);
    const dup = await call(listRoute.POST, { params: { slug: w.slug, projectId: w.projectP }, cookie: w.engineer.cookie, body: { typeId: "filter.lowpass", title: "Again", number: "C-001" } });
    expect(dup.status).toBe(409);
    expect(err(dup).fields?.number).toMatch(/already used/);
  });

  it("saves with the right version, refuses a stale one with 409 and overwrites nothing", async () => {
    const w = await makeWorld();
    const a = api(w);
    const first = await a.save(w.engineer.cookie, { version: 1, title: "First edit" });
    expect(first.status).toBe(200);
    expect(calcOf(first).version).toBe(2);
    const stale = await a.save(w.checker.cookie, { version: 1, title: "Stale edit" });
    expect(stale.status).toBe(409);
    expect(err(stale).message).toMatch(/Engineer saved a newer version \(v2\).*not saved/);
    expect(calcOf(await a.get(w.owner.cookie)).title).toBe("First edit");
  });

  it("keeps raw inputs that do not parse, without results, and refuses to submit them", async () => {
    const w = await makeWorld();
    const a = api(w);
    const c = calcOf(await a.get(w.engineer.cookie));
    const r = await a.save(w.engineer.cookie, { version: 1, inputs: { ...c.inputs, cutoff: "4kk7" } });
    expect(r.status).toBe(200);
    expect(calcOf(r).inputs.cutoff).toBe("4kk7");
    expect(calcOf(r).results).toBeNull();
    const sub = await a.go(w.engineer.cookie, { action: "submit", version: 2, checkerId: w.checker.id });
    expect(sub.status).toBe(422);
    expect(calcOf(await a.get(w.engineer.cookie)).status).toBe("draft");
  });

  it("refuses malformed saves with 4xx naming the field", async () => {
    const w = await makeWorld();
    const a = api(w);
    expect((await a.save(w.engineer.cookie, { title: "no version" })).status).toBe(422);
    expect(err(await a.save(w.engineer.cookie, { title: "no version" })).fields?.version).toBeDefined();
    expect((await a.save(w.engineer.cookie, { version: 1, inputs: "not an object" })).status).toBe(422);
    expect((await a.save(w.engineer.cookie, { version: 1, inputs: { big: "x".repeat(300_000) } })).status).toBe(422);
    expect((await a.save(w.engineer.cookie, { version: 1, title: "" })).status).toBe(422);
  });
});

describe("the check-and-approve workflow", () => {
  it("submit → return with comment → resubmit → approve, with mails to whoever acts next", async () => {
    const w = await makeWorld();
    const a = api(w);
    const sub = await a.go(w.engineer.cookie, { action: "submit", version: 1, checkerId: w.checker.id });
    expect(sub.status).toBe(200);
    expect(calcOf(sub).status).toBe("in_check");
    expect(outbox().at(-1)).toMatchObject({ to: w.checker.email, subject: expect.stringMatching(/^Please check C-001/) });

    // In check: no edits.
    const edit = await a.save(w.engineer.cookie, { version: 2, title: "sneaky" });
    expect(edit.status).toBe(409);
    expect(err(edit).message).toMatch(/in check/);

    // Engineers cannot return or approve; a return needs a comment.
    expect((await a.go(w.engineer.cookie, { action: "return", version: 2, comment: "x" })).status).toBe(403);
    const noComment = await a.go(w.checker.cookie, { action: "return", version: 2, comment: " " });
    expect(noComment.status).toBe(422);
    expect(err(noComment).fields?.comment).toMatch(/required/);
    const ret = await a.go(w.checker.cookie, { action: "return", version: 2, comment: "Use the 5 V rail, not 3.3 V." });
    expect(calcOf(ret).status).toBe("draft");
    expect(outbox().at(-1)).toMatchObject({ to: w.engineer.email, subject: expect.stringMatching(/returned with comments/) });
    expect(outbox().at(-1)!.text).toContain("Use the 5 V rail");
    const comments = await call(commentsRoute.GET, { params: { slug: w.slug, calcId: w.calcId }, cookie: w.engineer.cookie });
    expect(comments.body.comments).toEqual([expect.objectContaining({ kind: "return", body: "Use the 5 V rail, not 3.3 V.", author: "Checker" })]);

    const fixed = await a.save(w.engineer.cookie, { version: 3, title: "Fixed" });
    expect(fixed.status).toBe(200);
    expect((await a.go(w.engineer.cookie, { action: "submit", version: 4, checkerId: w.checker.id })).status).toBe(200);
    const ok = await a.go(w.checker.cookie, { action: "approve", version: 5 });
    expect(ok.status).toBe(200);
    expect(calcOf(ok).status).toBe("approved");
    expect((calcOf(ok) as Calc & { approvedBy: { name: string } }).approvedBy.name).toBe("Checker");
    expect(outbox().at(-1)).toMatchObject({ to: w.engineer.email, subject: expect.stringMatching(/is approved/) });

    const hist = await call(historyRoute.GET, { params: { slug: w.slug, calcId: w.calcId }, cookie: w.owner.cookie });
    expect((hist.body.entries as Array<{ event: string }>).map((e) => e.event)).toEqual(["create", "submit", "return", "save", "submit", "approve"]);
  });

  it("never lets the preparer approve their own calculation (403), even as a checker or owner", async () => {
    const w = await makeWorld();
    // The checker prepares a calculation and sends it to the owner.
    const made = await call(listRoute.POST, { params: { slug: w.slug, projectId: w.projectP }, cookie: w.checker.cookie, body: { typeId: "filter.lowpass", title: "Checker's own" } });
    const id = calcOf(made).id;
    const a = api(w, id);
    expect((await a.go(w.checker.cookie, { action: "submit", version: 1, checkerId: w.checker.id })).status).toBe(422); // cannot pick self
    expect((await a.go(w.checker.cookie, { action: "submit", version: 1, checkerId: w.client.id })).status).toBe(422); // a client cannot check
    expect((await a.go(w.checker.cookie, { action: "submit", version: 1, checkerId: w.owner.id })).status).toBe(200);
    const own = await a.go(w.checker.cookie, { action: "approve", version: 2 });
    expect(own.status).toBe(403);
    expect(err(own).message).toMatch(/you cannot approve it/);
    expect(calcOf(await a.get(w.owner.cookie)).status).toBe("in_check");
    expect((await a.go(w.owner.cookie, { action: "approve", version: 2 })).status).toBe(200);
  });

  it("refuses transitions from the wrong state or on a stale version, changing nothing", async () => {
    const w = await makeWorld();
    const a = api(w);
    for (const action of ["return", "approve", "reopen", "revise"]) {
      const r = await a.go(w.owner.cookie, { action, version: 1, comment: "c" });
      expect(r.status, action).toBe(409);
    }
    expect((await a.go(w.engineer.cookie, { action: "submit", version: 7, checkerId: w.checker.id })).status).toBe(409);
    expect((await a.go(w.engineer.cookie, { action: "publish", version: 1 })).status).toBe(422);
    const c = calcOf(await a.get(w.owner.cookie));
    expect([c.status, c.version]).toEqual(["draft", 1]);
  });

  it("reopening an approved calculation withdraws the approval", async () => {
    const w = await makeWorld();
    const a = api(w);
    await a.go(w.engineer.cookie, { action: "submit", version: 1, checkerId: w.checker.id });
    await a.go(w.checker.cookie, { action: "approve", version: 2 });
    expect((await a.save(w.engineer.cookie, { version: 3, title: "x" })).status).toBe(409);
    const r = await a.go(w.engineer.cookie, { action: "reopen", version: 3 });
    expect(calcOf(r).status).toBe("draft");
    expect((calcOf(r) as Calc & { approvedBy: unknown }).approvedBy).toBeNull();
  });
});

describe("issued revisions are immutable", () => {
  async function issue(w: World) {
    // Issuing itself belongs to the reports module; here the row is put in the issued state
    // with a stored report, as issuing leaves it.
    const now = Date.now();
    await write(async (db) => {
      await db.batch([
        db.update(calculations).set({ status: "issued", issuedAt: now, approvedBy: w.checker.id, version: 2 }).where(eq(calculations.id, w.calcId)),
        db.insert(reports).values({
          id: newId(),
          workspaceId: w.workspaceId,
          projectId: w.projectP,
          calculationId: w.calcId,
          revision: "A",
          code: `LW-${newId().slice(0, 8)}`,
          sha256: newId(),
          pdf: Buffer.from("%PDF-1.7 test"),
          snapshot: {},
          preparedByName: "Engineer",
          checkedByName: "Checker",
          approvedByName: "Checker",
          issuedBy: w.checker.id,
          issuedAt: now,
        }),
      ]);
    });
  }

  it("refuses every edit and transition through the API except starting a new revision", async () => {
    const w = await makeWorld();
    await issue(w);
    const a = api(w);
    const save = await a.save(w.owner.cookie, { version: 2, title: "changed" });
    expect(save.status).toBe(409);
    expect(err(save).message).toMatch(/Revision A is issued and cannot change/);
    for (const action of ["submit", "return", "approve", "reopen"]) expect((await a.go(w.owner.cookie, { action, version: 2, checkerId: w.checker.id, comment: "x" })).status, action).toBe(409);
    const before = calcOf(await a.get(w.owner.cookie));
    expect(before.title).toBe("Active low-pass filter test");

    const rev = await a.go(w.engineer.cookie, { action: "revise", version: 2 });
    expect(rev.status).toBe(200);
    expect(calcOf(rev)).toMatchObject({ status: "draft", revision: "B" });
    const db = await read();
    const rep = await db.query.reports.findFirst({ where: eq(reports.calculationId, w.calcId) });
    expect(rep?.supersededByRevision).toBe("B");
    expect(rep?.supersededAt).toBeGreaterThan(0);
    expect((await a.save(w.engineer.cookie, { version: 3, title: "Revision B work" })).status).toBe(200);
    // The issued revision's saved state is still in the history, unchanged.
    const hist = await call(historyRoute.GET, { params: { slug: w.slug, calcId: w.calcId }, cookie: w.owner.cookie });
    const revs = hist.body.revisions as Array<{ revision: string }>;
    expect(revs.map((r) => r.revision)).toEqual(["A", "B"]);
  });

  it("counts revision letters A…Z then AA", () => {
    expect(["A", "B", "Y", "Z", "AZ", "ZZ"].map(nextRevision)).toEqual(["B", "C", "Z", "AA", "BA", "AAA"]);
  });
});

describe("compare and register", () => {
  it("shows the inputs and results that changed between two saved states", async () => {
    const w = await makeWorld();
    const a = api(w);
    const c = calcOf(await a.get(w.engineer.cookie));
    const saved = await a.save(w.engineer.cookie, { version: 1, inputs: { ...c.inputs, cutoff: "2k" } });
    expect(saved.status).toBe(200);
    const hist = await call(historyRoute.GET, { params: { slug: w.slug, calcId: w.calcId }, cookie: w.engineer.cookie });
    const [e1, e2] = hist.body.entries as Array<{ id: string }>;
    const cmp = await call(compareRoute.GET, { params: { slug: w.slug, calcId: w.calcId }, cookie: w.engineer.cookie, url: `http://x/api?a=${e1.id}&b=${e2.id}` });
    expect(cmp.status).toBe(200);
    const inputs = cmp.body.inputs as Array<{ key: string; a: string; b: string; changed: boolean }>;
    expect(inputs.find((r) => r.key === "cutoff")).toMatchObject({ a: "1k", b: "2k", changed: true });
    expect(inputs.find((r) => r.key === "order")).toMatchObject({ changed: false });
    expect((cmp.body.results as Array<{ changed: boolean }>).some((r) => r.changed)).toBe(true);
    const bad = await call(compareRoute.GET, { params: { slug: w.slug, calcId: w.calcId }, cookie: w.engineer.cookie, url: `http://x/api?a=${e1.id}&b=nope` });
    expect(bad.status).toBe(404);
  });

  it("filters, searches, sorts and pages the register in the database", async () => {
    const w = await makeWorld();
    const now = Date.now();
    const rows = Array.from({ length: 59 }, (_, i) => ({
      ...draftCalculation({ id: newId(), workspaceId: w.workspaceId, projectId: w.projectP, preparedBy: w.engineer.id, number: `C-${String(i + 2).padStart(3, "0")}`, now: now + i }),
      title: i % 3 === 0 ? `Reference divider ${i}` : `Sensor stage ${i}`,
      status: (i % 4 === 0 ? "approved" : "draft") as "approved" | "draft",
      results: null,
    }));
    await write(async (db) => {
      for (let i = 0; i < rows.length; i += 20) await db.insert(calculations).values(rows.slice(i, i + 20));
    });
    const list = (q: string) => call(listRoute.GET, { params: { slug: w.slug, projectId: w.projectP }, cookie: w.engineer.cookie, url: `http://x/api?${q}` });
    const page1 = await list("pageSize=25&sort=number&dir=asc");
    expect(page1.body.total).toBe(60);
    expect((page1.body.rows as Array<{ number: string }>).map((r) => r.number).slice(0, 3)).toEqual(["C-001", "C-002", "C-003"]);
    const page3 = await list("pageSize=25&page=3&sort=number&dir=asc");
    expect((page3.body.rows as unknown[]).length).toBe(10);
    const approved = await list("status=approved");
    expect(approved.body.total).toBe(15); // i = 0, 4, …, 56
    const search = await list("q=divider");
    expect(search.body.total).toBe(20); // i = 0, 3, …, 57
    expect((await list("pack=filter")).body.total).toBe(60);
    expect((await list("pack=reference")).body.total).toBe(0);
    expect((await list("q=%25")).body.total).toBe(0); // % is searched literally
    expect((await list("sort=colour")).status).toBe(422);
    expect((await list("pageSize=5000")).status).toBe(422);
  });
});

describe("compute route", () => {
  it("answers 402 pack_locked for a pack the workspace does not have", async () => {
    const w = await makeWorld({ status: "active" });
    await write((db) => db.update(workspaces).set({ packs: ["amplifier"] }).where(eq(workspaces.id, w.workspaceId)));
    const c = calcOf(await api(w).get(w.engineer.cookie));
    const r = await call(computeRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { typeId: "filter.lowpass", inputs: c.inputs } });
    expect(r.status).toBe(402);
    expect(err(r).code).toBe("pack_locked");
    expect(err(r).message).toMatch(/Active filter pack/);
  });

  it("computes valid inputs and names each invalid field (422)", async () => {
    const w = await makeWorld();
    const c = calcOf(await api(w).get(w.engineer.cookie));
    const ok = await call(computeRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { typeId: "filter.lowpass", inputs: c.inputs } });
    expect(ok.status).toBe(200);
    expect((ok.body.output as { checks: unknown[] }).checks.length).toBeGreaterThan(0);
    const bad = await call(computeRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { typeId: "filter.lowpass", inputs: { ...c.inputs, cutoff: "4kk7" } } });
    expect(bad.status).toBe(422);
    expect(err(bad).fields?.cutoff).toMatch(/Cutoff frequency/);
    const order = await call(computeRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { typeId: "filter.lowpass", inputs: { ...c.inputs, order: 9 } } });
    expect(order.status).toBe(422);
    expect(err(order).fields?.order).toMatch(/8/);
  });
});

describe("concurrency on one SQLite file", () => {
  it("50 users autosaving different calculations at once: all saved, no 500, no lock errors", async () => {
    const worlds = await Promise.all(Array.from({ length: 10 }, () => makeWorld()));
    // Five more calculations per world, so 50 distinct calculations with 50 distinct users' sessions.
    const now = Date.now();
    const targets: Array<{ w: World; calcId: string; cookie: string }> = [];
    for (const w of worlds) {
      const extra = Array.from({ length: 4 }, (_, i) => draftCalculation({ id: newId(), workspaceId: w.workspaceId, projectId: w.projectP, preparedBy: w.engineer.id, number: `C-10${i}`, now }));
      await write((db) => db.insert(calculations).values(extra));
      const cookies = [w.owner.cookie, w.engineer.cookie, w.checker.cookie, w.owner.cookie, w.engineer.cookie];
      [w.calcId, ...extra.map((e) => e.id)].forEach((calcId, i) => targets.push({ w, calcId, cookie: cookies[i] }));
    }
    expect(targets.length).toBe(50);
    const results = await Promise.all(targets.map((t, i) => api(t.w, t.calcId).save(t.cookie, { version: 1, title: `Autosave ${i}` })));
    expect(results.map((r) => r.status)).toEqual(Array(50).fill(200));
    // Second round on the new versions, still all at once.
    const again = await Promise.all(targets.map((t, i) => api(t.w, t.calcId).save(t.cookie, { version: 2, title: `Autosave ${i} again` })));
    expect(again.map((r) => r.status)).toEqual(Array(50).fill(200));
    const db = await read();
    for (const [i, t] of targets.entries()) {
      const row = await db.query.calculations.findFirst({ where: eq(calculations.id, t.calcId) });
      expect([row?.title, row?.version]).toEqual([`Autosave ${i} again`, 3]);
    }
  });

  it("two users saving the same calculation at once: one wins, the other gets 409, nothing is lost silently", async () => {
    const w = await makeWorld();
    const a = api(w);
    const [x, y] = await Promise.all([a.save(w.engineer.cookie, { version: 1, title: "Engineer's title" }), a.save(w.checker.cookie, { version: 1, title: "Checker's title" })]);
    expect([x.status, y.status].sort()).toEqual([200, 409]);
    const winner = x.status === 200 ? "Engineer's title" : "Checker's title";
    const c = calcOf(await a.get(w.owner.cookie));
    expect([c.title, c.version]).toEqual([winner, 2]);
    const hist = await call(historyRoute.GET, { params: { slug: w.slug, calcId: w.calcId }, cookie: w.owner.cookie });
    expect((hist.body.entries as unknown[]).length).toBe(2); // create + the one save that applied
  });
});
