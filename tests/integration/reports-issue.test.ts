/**
 * Issuing a report through the real route handlers: the stored, signed PDF (checked with Debian's
 * pdfsig), what it prints (checked with pdftotext against the engine's own numbers, formatted as
 * the app formats them), revisions and supersession, the client mail, and the failure paths
 * (wrong state, stale or concurrent issue, a failing batch): never an issued revision without its
 * PDF, never a PDF without its issued revision.
 */
import { createHash } from "node:crypto";
import { and, eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { read, write } from "@/db/write";
import { auditEvents, calculationHistory, calculations, reports, signingIdentities } from "@/db/schema";
import { getCalcType } from "@/lib/calc/registry";
import { describeInputs, parseRawInputs } from "@/lib/calc/core/inputs";
import { formatQuantity } from "@/lib/calc/core/units";
import type { CalcOutput, RawInputs } from "@/lib/calc/core/types";
import { CODE_PATTERN } from "@/lib/reports/code";
import { outbox } from "@/lib/mail";
import { issueReport } from "@/lib/reports/issue";
import { authorize } from "@/lib/auth/guard";
import { call, draftCalculation, makeWorld, setupDb, type World } from "./helpers";
import { approve, approveAndIssue, assertInvariant, bodyText, calcVersion, download, fold, issueAs, pdfsig, pdftotext, pdftotextLayout, transitionAs } from "./reports-support";
import * as reportsRoute from "@/app/api/w/[slug]/reports/route";
import { newId } from "@/lib/ids";
import { users } from "@/db/schema";

type Handler<P> = (req: Request, ctx: { params: Promise<P> }) => Promise<Response>;

beforeAll(async () => {
  await setupDb();
});

async function reportRows(calcId: string) {
  const db = await read();
  return db.select().from(reports).where(eq(reports.calculationId, calcId));
}

async function calcRow(calcId: string) {
  const db = await read();
  const c = await db.query.calculations.findFirst({ where: eq(calculations.id, calcId) });
  if (!c) throw new Error("calculation gone");
  return c;
}

/** A second draft calculation of `typeId` in project P, prepared by the engineer. */
async function addCalc(w: World, typeId: string, number: string): Promise<string> {
  const id = newId();
  const row = draftCalculation({ id, workspaceId: w.workspaceId, projectId: w.projectP, preparedBy: w.engineer.id, number, typeId, now: Date.now() });
  await write((db) =>
    db.batch([
      db.insert(calculations).values(row),
      db.insert(calculationHistory).values({ id: newId(), workspaceId: w.workspaceId, calculationId: id, revision: "A", version: 1, event: "create", status: "draft", title: row.title, inputs: row.inputs, results: row.results, engineVersion: row.engineVersion, actorId: w.engineer.id, at: Date.now() }),
    ]),
  );
  return id;
}

/** Text with all whitespace removed: pdftotext breaks lines inside table cells and long formulas. */
const squash = (s: string) => s.replace(/\s+/g, "");

describe("issuing an approved calculation", () => {
  it("stores the signed PDF, marks the calculation issued, and records history, audit and the signing identity", async () => {
    const w = await makeWorld();
    await approve(w);
    const before = await calcRow(w.calcId);
    const r = await issueAs(w, w.checker);
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    const rep = r.body.report as { id: string; code: string; revision: string; sha256: string; filename: string; preparedByName: string; checkedByName: string; approvedByName: string };
    expect(rep.code).toMatch(CODE_PATTERN);
    expect(rep.revision).toBe("A");
    expect(rep.filename).toBe("C-001 rev A – Active low-pass filter test.pdf");
    expect([rep.preparedByName, rep.checkedByName, rep.approvedByName]).toEqual(["Engineer", "Checker", "Checker"]);

    const after = await calcRow(w.calcId);
    expect(after.status).toBe("issued");
    expect(after.version).toBe(before.version + 1);
    expect(after.issuedAt).toBeGreaterThan(0);
    // The calculation itself is unchanged by issuing: what was approved is what is issued.
    expect(after.inputs).toEqual(before.inputs);
    expect(after.results).toEqual(before.results);

    const [row] = await reportRows(w.calcId);
    expect(row.id).toBe(rep.id);
    expect(createHash("sha256").update(row.pdf).digest("hex")).toBe(row.sha256);
    expect(row.pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    const snap = row.snapshot as { calculation: { status: string }; results: unknown[]; verification: { url: string }; signer: { fingerprint: string } };
    expect(snap.calculation.status).toBe("issued");
    expect(snap.verification.url).toBe(`http://localhost:3999/verify?code=${rep.code}`);

    const db = await read();
    const hist = await db.select().from(calculationHistory).where(eq(calculationHistory.calculationId, w.calcId));
    const issue = hist.filter((h) => h.event === "issue");
    expect(issue).toHaveLength(1);
    expect(issue[0]).toMatchObject({ status: "issued", revision: "A", version: after.version, actorId: w.checker.id });
    const audit = await db.select().from(auditEvents).where(and(eq(auditEvents.targetId, w.calcId), eq(auditEvents.action, "report.issued")));
    expect(audit).toHaveLength(1);
    expect(audit[0].data).toMatchObject({ reportId: rep.id, code: rep.code, sha256: rep.sha256 });

    const ids = await db.select().from(signingIdentities).where(eq(signingIdentities.workspaceId, w.workspaceId));
    expect(ids).toHaveLength(1);
    expect(ids[0].fingerprint).toBe(snap.signer.fingerprint);
    // The private key is stored encrypted, never as PEM.
    expect(ids[0].encryptedKey).not.toContain("PRIVATE KEY");
    expect(Buffer.from(ids[0].encryptedKey, "base64").toString("latin1")).not.toContain("PRIVATE KEY");
    await assertInvariant();
  });

  it("is allowed to owners and checkers only; an engineer or a client gets 403 and nothing changes", async () => {
    const w = await makeWorld();
    await approve(w);
    for (const who of [w.engineer, w.client]) {
      const r = await issueAs(w, who);
      expect(r.status).toBe(403);
      expect((r.body.error as { code: string }).code).toBe("forbidden");
    }
    expect(await reportRows(w.calcId)).toHaveLength(0);
    expect((await calcRow(w.calcId)).status).toBe("approved");
    const r = await issueAs(w, w.owner);
    expect(r.status).toBe(201);
  });

  it("serves the stored bytes; pdfsig finds the signature valid over the whole file, and one changed byte breaks it", async () => {
    const w = await makeWorld();
    const rep = await approveAndIssue(w);
    const d = await download(w, w.engineer, rep.id);
    expect(d.status).toBe(200);
    expect(d.headers.get("content-type")).toBe("application/pdf");
    const disp = d.headers.get("content-disposition") ?? "";
    expect(disp).toContain(`filename*=UTF-8''${encodeURIComponent("C-001 rev A – Active low-pass filter test.pdf")}`);
    expect(disp).toContain('filename="C-001 rev A - Active low-pass filter test.pdf"');
    const [row] = await reportRows(w.calcId);
    expect(d.bytes.equals(Buffer.from(row.pdf))).toBe(true);

    const ok = pdfsig(d.bytes);
    expect(ok).toContain("Signature is Valid.");
    expect(ok).toContain("Total document signed");
    expect(ok).toContain("Signer Certificate Common Name: Test Firm A");

    // Change one byte inside the first content stream (covered by the signature's byte range).
    const at = d.bytes.indexOf("stream\n") + 40;
    expect(at).toBeGreaterThan(40);
    const tampered = Buffer.from(d.bytes);
    tampered[at] = tampered[at] ^ 0x01;
    const bad = pdfsig(tampered);
    expect(bad).toContain("Signature Validation:");
    expect(bad).not.toContain("Signature is Valid.");
  });

  for (const typeId of ["filter.lowpass", "amplifier.gain-stage"]) {
    it(`prints the inputs, the formulas with their values and the results the engine computed (${typeId})`, async () => {
      const w = await makeWorld();
      const calcId = typeId === "filter.lowpass" ? w.calcId : await addCalc(w, typeId, "C-002");
      const rep = await approveAndIssue(w, calcId);
      // The report prints "X_sub" as X with a subscript, so the underscore is not in the text.
      const text = squash(bodyText(pdftotext((await download(w, w.client, rep.id)).bytes)));

      // Recompute independently of the stored snapshot: the PDF must show what the engine computes.
      const type = getCalcType(typeId)!;
      const c = await calcRow(calcId);
      const parsed = parseRawInputs(type, c.inputs as RawInputs);
      expect(parsed.ok).toBe(true);
      if (!parsed.ok) return;
      const out: CalcOutput = type.compute(parsed.input);
      const missing: string[] = [];
      const want = (what: string, s: string) => {
        if (!text.includes(squash(s).replace(/_/g, ""))) missing.push(`${what}: ${s}`);
      };
      for (const row of describeInputs(type, parsed.input, c.inputs as RawInputs)) {
        want("input label", row.label);
        want("input value", row.display);
      }
      expect(out.formulas.length).toBeGreaterThan(0);
      for (const f of out.formulas) {
        const rhs = (s: string) => (s.includes(" = ") ? s.slice(s.indexOf(" = ") + 3) : s);
        want("formula", rhs(f.symbolic));
        want("formula with values", rhs(f.substituted));
        want("formula result", formatQuantity(f.value, f.unit));
      }
      for (const r of out.results) {
        want("result label", r.label);
        want("result value", formatQuantity(r.value, r.unit));
      }
      for (const ch of out.checks) want("check", ch.title);
      for (const p of out.components) want("component", p.display);
      expect(missing).toEqual([]);
    }, 60_000);
  }

  it("never lets the preparer issue their own calculation (403), and changes nothing", async () => {
    const w = await makeWorld();
    // The checker prepares and submits to the owner, who approves; the checker may not issue it.
    await write((db) => db.update(calculations).set({ preparedBy: w.checker.id }).where(eq(calculations.id, w.calcId)));
    await transitionAs(w, w.checker, w.calcId, { action: "submit", checkerId: w.owner.id });
    await transitionAs(w, w.owner, w.calcId, { action: "approve" });
    const r = await issueAs(w, w.checker);
    expect(r.status).toBe(403);
    expect(JSON.stringify(r.body)).toMatch(/someone else \(a checker or owner\) must issue it/);
    expect((await calcRow(w.calcId)).status).toBe("approved");
    expect(await reportRows(w.calcId)).toEqual([]);
    expect((await issueAs(w, w.owner)).status).toBe(201);
  });

  it("prints the sign-off (prepared, checked, approved with dates), engine version, verification code and verify URL", async () => {
    const w = await makeWorld();
    // Checked (the check approved) by the checker, approved for issue by the owner who issues
    // it: three different names in the sign-off.
    await transitionAs(w, w.engineer, w.calcId, { action: "submit", checkerId: w.checker.id });
    await transitionAs(w, w.checker, w.calcId, { action: "approve" });
    const r = await issueAs(w, w.owner);
    expect(r.status).toBe(201);
    const rep = r.body.report as { id: string; code: string };
    const bytes = (await download(w, w.owner, rep.id)).bytes;
    const layout = pdftotextLayout(bytes);
    const c = await calcRow(w.calcId);
    const day = (ms: number | null) => new Date(ms!).toISOString().slice(0, 10);
    const db = await read();
    const submitted = (await db.select().from(calculationHistory).where(and(eq(calculationHistory.calculationId, w.calcId), eq(calculationHistory.event, "submit"))))[0];
    expect(layout).toMatch(/PREPARED BY\s+CHECKED BY\s+APPROVED BY/i);
    expect(layout).toMatch(/Engineer\s+Checker\s+Owner/);
    expect(layout).toContain(`${day(submitted.at)}`);
    expect(layout).toMatch(new RegExp(`${day(submitted.at)}\\s+${day(c.approvedAt)}\\s+${day(c.issuedAt)}`));
    const text = fold(pdftotext(bytes));
    expect(text).toContain(`filter.lowpass@${getCalcType("filter.lowpass")!.version}`);
    expect(text).toContain(rep.code);
    expect(squash(text)).toContain(squash(`http://localhost:3999/verify?code=${rep.code}`));
    expect(text).toContain("Test Firm A");
    expect(text).toContain("Project P");
    expect(text).toContain(`A ${day(c.issuedAt)} First issue. Engineer`);
    const [row] = await reportRows(w.calcId);
    expect([row.preparedByName, row.checkedByName, row.approvedByName]).toEqual(["Engineer", "Checker", "Owner"]);
  });

  it("issues a new revision as a new report; the old one is superseded and stays downloadable", async () => {
    const w = await makeWorld();
    const a = await approveAndIssue(w);
    await transitionAs(w, w.engineer, w.calcId, { action: "revise", comment: "Capacitors re-selected from E24." });
    // The revise step marks revision A superseded at once.
    const [rowA] = await reportRows(w.calcId);
    expect(rowA.supersededByRevision).toBe("B");
    expect(rowA.supersededAt).toBeGreaterThan(0);
    const b = await approveAndIssue(w);
    expect(b.revision).toBe("B");
    expect(b.code).not.toBe(a.code);
    const rows = await reportRows(w.calcId);
    expect(rows.map((r) => r.revision).sort()).toEqual(["A", "B"]);
    expect(rows.find((r) => r.revision === "B")!.supersededAt).toBeNull();

    const old = await download(w, w.client, a.id);
    expect(old.status).toBe(200);
    expect(pdfsig(old.bytes)).toContain("Signature is Valid.");
    const textB = fold(pdftotext((await download(w, w.client, b.id)).bytes));
    expect(textB).toContain("Supersedes revision A. Capacitors re-selected from E24.");

    const list = await call(reportsRoute.GET as Handler<{ slug: string }>, { params: { slug: w.slug }, cookie: w.engineer.cookie, url: `http://localhost:3999/api/w/${w.slug}/reports?calculationId=${w.calcId}` });
    expect(list.status).toBe(200);
    const listed = list.body.reports as Array<{ revision: string; supersededByRevision: string | null }>;
    expect(listed.map((r) => [r.revision, r.supersededByRevision])).toEqual([
      ["B", null],
      ["A", "B"],
    ]);
    await assertInvariant();
  }, 60_000);

  it("e-mails the clients of the project, after the commit, with a link to it", async () => {
    const w = await makeWorld();
    const n = outbox().length;
    const rep = await approveAndIssue(w);
    const mails = outbox().slice(n).filter((m) => m.subject.startsWith("Report issued"));
    expect(mails.map((m) => m.to)).toEqual([w.client.email]);
    expect(mails[0].subject).toBe("Report issued: C-001 rev A – Active low-pass filter test");
    expect(mails[0].text).toContain(`http://localhost:3999/w/${w.slug}/projects/${w.projectP}`);
    expect(mails[0].text).toContain(rep.code);
  });
});

describe("issuing fails cleanly", () => {
  it("answers 409 for a draft, a calculation in check, a stale version and an issued one; no report row is written", async () => {
    const w = await makeWorld();
    let r = await issueAs(w, w.checker);
    expect(r.status).toBe(409);
    expect((r.body.error as { message: string }).message).toContain("Only an approved calculation can be issued");
    await transitionAs(w, w.engineer, w.calcId, { action: "submit", checkerId: w.checker.id });
    r = await issueAs(w, w.checker);
    expect(r.status).toBe(409);
    await transitionAs(w, w.checker, w.calcId, { action: "approve" });
    const v = await calcVersion(w.calcId);
    r = await issueAs(w, w.checker, w.calcId, v - 1);
    expect(r.status).toBe(409);
    expect((r.body.error as { fields: Record<string, string> }).fields.version).toBe(`is ${v} now`);
    expect(await reportRows(w.calcId)).toHaveLength(0);
    expect((await calcRow(w.calcId)).status).toBe("approved");
    expect((await issueAs(w, w.checker)).status).toBe(201);
    r = await issueAs(w, w.checker);
    expect(r.status).toBe(409);
    expect(await reportRows(w.calcId)).toHaveLength(1);
  });

  it("refuses (409) a calculation computed by an older engine version than the one installed: the report must print what was approved", async () => {
    const w = await makeWorld();
    await approve(w);
    await write((db) => db.update(calculations).set({ engineVersion: "0.9.0" }).where(eq(calculations.id, w.calcId)));
    const r = await issueAs(w, w.checker);
    expect(r.status).toBe(409);
    expect((r.body.error as { message: string }).message).toContain("engine was updated (0.9.0 →");
    expect(await reportRows(w.calcId)).toHaveLength(0);
    expect((await calcRow(w.calcId)).status).toBe("approved");
  });

  it("two concurrent issues of the same version: one report, the other 409", async () => {
    const w = await makeWorld();
    await approve(w);
    const v = await calcVersion(w.calcId);
    const [x, y] = await Promise.all([issueAs(w, w.checker, w.calcId, v), issueAs(w, w.owner, w.calcId, v)]);
    expect([x.status, y.status].sort()).toEqual([201, 409]);
    expect(await reportRows(w.calcId)).toHaveLength(1);
    const db = await read();
    const hist = await db.select().from(calculationHistory).where(and(eq(calculationHistory.calculationId, w.calcId), eq(calculationHistory.event, "issue")));
    expect(hist).toHaveLength(1);
    await assertInvariant();
  }, 60_000);

  it("the calculation reopened while its PDF was being signed: 409, no report, still a draft", async () => {
    const w = await makeWorld();
    await approve(w);
    const v = await calcVersion(w.calcId);
    const user = (await (await read()).query.users.findFirst({ where: eq(users.id, w.checker.id) }))!;
    const ctx = await authorize(user, w.slug, "calc.issue");
    const p = issueReport(ctx, w.calcId, { version: v }, {
      onStep: async (s) => {
        if (s === "signed") await transitionAs(w, w.engineer, w.calcId, { action: "reopen", comment: "One more change." });
      },
    });
    await expect(p).rejects.toMatchObject({ code: "conflict" });
    expect(await reportRows(w.calcId)).toHaveLength(0);
    expect((await calcRow(w.calcId)).status).toBe("draft");
    await assertInvariant();
  }, 60_000);

  it("a batch that fails half-way leaves neither the issued status nor the report", async () => {
    const w = await makeWorld();
    await approve(w);
    const before = await calcRow(w.calcId);
    // The audit insert is the last row of the batch; make the database refuse it.
    await write((db) => db.run(sql.raw(`CREATE TRIGGER refuse_report_audit BEFORE INSERT ON audit_events WHEN NEW.action = 'report.issued' BEGIN SELECT RAISE(ABORT, 'test: audit refused'); END`)));
    try {
      const r = await issueAs(w, w.checker);
      expect(r.status).toBe(500);
      expect((r.body.error as { message: string }).message).toContain("Nothing was changed");
    } finally {
      await write((db) => db.run(sql.raw("DROP TRIGGER refuse_report_audit")));
    }
    const after = await calcRow(w.calcId);
    expect(after.status).toBe("approved");
    expect(after.version).toBe(before.version);
    expect(await reportRows(w.calcId)).toHaveLength(0);
    const db = await read();
    expect(await db.select().from(calculationHistory).where(and(eq(calculationHistory.calculationId, w.calcId), eq(calculationHistory.event, "issue")))).toHaveLength(0);
    await assertInvariant();
    // Nothing is stuck: the same issue succeeds once the database accepts it.
    expect((await issueAs(w, w.checker)).status).toBe(201);
  }, 60_000);

  it("concurrent first issues in a workspace create one signing identity and sign with it", async () => {
    const w = await makeWorld();
    const second = await addCalc(w, "filter.lowpass", "C-002");
    await approve(w);
    await approve(w, second);
    const [x, y] = await Promise.all([issueAs(w, w.checker), issueAs(w, w.owner, second)]);
    expect([x.status, y.status]).toEqual([201, 201]);
    const db = await read();
    const ids = await db.select().from(signingIdentities).where(eq(signingIdentities.workspaceId, w.workspaceId));
    expect(ids).toHaveLength(1);
    const rows = [...(await reportRows(w.calcId)), ...(await reportRows(second))];
    expect(rows.map((r) => (r.snapshot as { signer: { fingerprint: string } }).signer.fingerprint)).toEqual([ids[0].fingerprint, ids[0].fingerprint]);
    for (const r of rows) expect(pdfsig(Buffer.from(r.pdf))).toContain("Signature is Valid.");
  }, 90_000);
});
