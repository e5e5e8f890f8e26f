/**
 * Public verification (/api/verify): by code and by uploading the PDF. The issued file matches
 * byte for byte (SHA-256); a file with one changed byte, an unknown code and a non-code do not;
 * a superseded revision says so; attempts are rate limited per IP (429) and uploads size limited
 * (413), each with a clear message.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { call, makeWorld, setupDb, type World } from "./helpers";
import { approveAndIssue, download, transitionAs } from "./reports-support";
import { MAX_VERIFY_BYTES, VERIFY_LIMIT } from "@/lib/reports/verify";
import * as verifyRoute from "@/app/api/verify/route";

type Handler = (req: Request, ctx: { params: Promise<Record<string, never>> }) => Promise<Response>;

beforeAll(async () => {
  await setupDb();
});

let ipSeq = 0;
/** A fresh client address per test, so the rate limit of one test does not touch another. */
const freshIp = () => `198.51.100.${++ipSeq}`;

async function byCode(code: string, ip = freshIp()) {
  return call(verifyRoute.GET as Handler, { url: `http://localhost:3999/api/verify?code=${encodeURIComponent(code)}`, headers: { "x-forwarded-for": ip } });
}

async function byFile(bytes: Uint8Array, ip = freshIp(), name = "report.pdf") {
  const form = new FormData();
  form.append("file", new Blob([new Uint8Array(bytes)], { type: "application/pdf" }), name);
  const req = new Request("http://localhost:3999/api/verify", { method: "POST", body: form, headers: { "x-forwarded-for": ip } });
  const res = await (verifyRoute.POST as Handler)(req, { params: Promise.resolve({}) });
  return { status: res.status, headers: res.headers, body: (await res.json()) as Record<string, unknown> };
}

interface Result {
  match: boolean;
  message: string;
  method: string;
  sha256?: string;
  claimedCode?: string;
  report?: {
    code: string;
    workspace: string;
    project: string;
    calculationNumber: string;
    revision: string;
    issueDate: string;
    preparedBy: string;
    checkedBy: string;
    approvedBy: string;
    sha256: string;
    superseded: null | { byRevision: string | null; latestIssued: null | { revision: string; code: string } };
  };
}

describe("verifying a report", () => {
  let w: World;
  let rep: { id: string; code: string; sha256: string };
  let pdf: Buffer;

  beforeAll(async () => {
    w = await makeWorld();
    rep = await approveAndIssue(w);
    pdf = (await download(w, w.client, rep.id)).bytes;
  }, 60_000);

  it("by code: names the report, who signed it off, its revision, date, workspace and project", async () => {
    const r = await byCode(rep.code);
    expect(r.status).toBe(200);
    const res = r.body.result as Result;
    expect(res.match).toBe(true);
    expect(res.report).toMatchObject({
      code: rep.code,
      workspace: "Test Firm A",
      project: "Project P",
      calculationNumber: "C-001",
      revision: "A",
      preparedBy: "Engineer",
      checkedBy: "Checker",
      approvedBy: "Checker",
      sha256: rep.sha256,
      superseded: null,
    });
    expect(res.report!.issueDate).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    expect(res.message).toContain("It is the current revision.");
  });

  it("by code: accepts the code as people type it (lower case, no dashes)", async () => {
    const typed = rep.code.toLowerCase().replace(/-/g, " ");
    const res = (await byCode(typed)).body.result as Result;
    expect(res.match).toBe(true);
    expect(res.report!.code).toBe(rep.code);
  });

  it("by code: an unknown code and something that is not a code do not match", async () => {
    const unknown = rep.code.endsWith("0") ? `${rep.code.slice(0, -1)}1` : `${rep.code.slice(0, -1)}0`;
    const a = (await byCode(unknown)).body.result as Result;
    expect(a.match).toBe(false);
    expect(a.message).toContain("No issued report has the code");
    expect(a.report).toBeUndefined();
    const b = (await byCode("hello world")).body.result as Result;
    expect(b.match).toBe(false);
    expect(b.message).toContain("not a verification code");
  });

  it("by file: the issued PDF matches byte for byte", async () => {
    const r = await byFile(pdf);
    expect(r.status).toBe(200);
    const res = r.body.result as Result;
    expect(res.match).toBe(true);
    expect(res.sha256).toBe(rep.sha256);
    expect(res.report!.code).toBe(rep.code);
    expect(res.message).toContain("exactly the issued report");
  });

  it("by file: one changed byte, one byte added or removed, or another file does not match any issued report", async () => {
    const flipped = Buffer.from(pdf);
    const at = flipped.indexOf("stream\n") + 40;
    flipped[at] ^= 0x20;
    const variants = [flipped, Buffer.concat([pdf, Buffer.from("\n")]), pdf.subarray(0, pdf.length - 1), Buffer.from("%PDF-1.7\nnot a report\n%%EOF\n")];
    for (const v of variants) {
      const res = (await byFile(v)).body.result as Result;
      expect(res.match).toBe(false);
      expect(res.message).toContain("does not match any issued report");
      expect(res.report).toBeUndefined();
    }
    // A changed report still names its code in the signature: the page says which report it claims to be.
    const res = (await byFile(flipped)).body.result as Result;
    expect(res.claimedCode).toBe(rep.code);
    expect(res.message).toContain("changed since");
  });

  it("shows a superseded revision as such, and the newer issue once there is one", async () => {
    const w2 = await makeWorld();
    const a = await approveAndIssue(w2);
    await transitionAs(w2, w2.engineer, w2.calcId, { action: "revise" });
    let res = (await byCode(a.code)).body.result as Result;
    expect(res.match).toBe(true);
    expect(res.report!.superseded).toMatchObject({ byRevision: "B", latestIssued: null });
    expect(res.message).toContain("revision B was started");
    const b = await approveAndIssue(w2);
    const aPdf = (await download(w2, w2.client, a.id)).bytes;
    res = (await byFile(aPdf)).body.result as Result;
    expect(res.match).toBe(true);
    expect(res.report!.superseded).toMatchObject({ byRevision: "B", latestIssued: { revision: "B", code: b.code } });
    expect(res.message).toContain("It has been superseded: revision B was issued on");
    res = (await byCode(b.code)).body.result as Result;
    expect(res.report!.superseded).toBeNull();
  }, 60_000);

  it("is rate limited per IP with a clear 429; another IP is not affected", async () => {
    const ip = freshIp();
    for (let i = 0; i < VERIFY_LIMIT.max; i++) expect((await byCode(rep.code, ip)).status).toBe(200);
    const over = await byCode(rep.code, ip);
    expect(over.status).toBe(429);
    expect((over.body.error as { code: string; message: string }).message).toContain("Too many verification attempts");
    expect(Number(over.headers.get("retry-after"))).toBeGreaterThan(0);
    // Uploads count against the same limit.
    expect((await byFile(pdf, ip)).status).toBe(429);
    expect((await byCode(rep.code, freshIp())).status).toBe(200);
  });

  it("refuses an upload over the size limit (413) and a request without a file, with clear messages", async () => {
    const big = Buffer.alloc(MAX_VERIFY_BYTES + 1, 0x20);
    const r = await byFile(big);
    expect(r.status).toBe(413);
    expect((r.body.error as { message: string }).message).toMatch(/at most 20 MB/);
    const notForm = await call(verifyRoute.POST as Handler, { method: "POST", body: { code: rep.code }, headers: { "x-forwarded-for": freshIp() } });
    expect(notForm.status).toBe(415);
    const noCode = await call(verifyRoute.GET as Handler, { url: "http://localhost:3999/api/verify", headers: { "x-forwarded-for": freshIp() } });
    expect(noCode.status).toBe(422);
  });
});
