/**
 * Report, issue and export routes in the permission matrix (see ../permission-matrix.test.ts).
 *
 * The world's calculation is a draft, so the issue route answers the roles allowed to issue
 * (owner, checker) with 409 "only an approved calculation can be issued" and the others with 403.
 * The report routes need an issued report: their handlers are wrapped so that, before the call,
 * a report row "rep-<calculation id>" is stored for the calculation the id names (in that
 * calculation's workspace), with its calculation marked issued. A report of the world's
 * calculation lies in project P, which is shared with the client; the foreign params name a
 * report of the other workspace.
 */
import { eq } from "drizzle-orm";
import type { RouteCase } from "../permission-matrix.test";
import { write } from "@/db/write";
import { calculations, reports } from "@/db/schema";
import { newId, sha256Hex } from "@/lib/ids";
import { generateVerificationCode } from "@/lib/reports/code";
import * as issueRoute from "@/app/api/w/[slug]/calculations/[calcId]/issue/route";
import * as componentsRoute from "@/app/api/w/[slug]/calculations/[calcId]/export/components/route";
import * as netlistRoute from "@/app/api/w/[slug]/calculations/[calcId]/export/netlist/route";
import * as jsonRoute from "@/app/api/w/[slug]/calculations/[calcId]/export/json/route";
import * as reportsRoute from "@/app/api/w/[slug]/reports/route";
import * as reportRoute from "@/app/api/w/[slug]/reports/[reportId]/route";
import * as pdfRoute from "@/app/api/w/[slug]/reports/[reportId]/pdf/route";

type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

const STAFF = (ok: number) => ({ owner: ok, engineer: ok, checker: ok, client: 403 });
const EVERYONE = (ok: number) => ({ owner: ok, engineer: ok, checker: ok, client: ok });
const calc = (w: { slug: string; calcId: string }) => ({ slug: w.slug, calcId: w.calcId });
const foreignCalc = (w: { slug: string; otherCalcId: string }) => ({ slug: w.slug, calcId: w.otherCalcId });

/** Store an issued report "rep-<calcId>" for that calculation, once. */
async function seedReport(reportId: string): Promise<void> {
  if (!reportId.startsWith("rep-")) return;
  const calcId = reportId.slice(4);
  await write(async (db) => {
    const c = await db.query.calculations.findFirst({ where: eq(calculations.id, calcId) });
    if (!c) return;
    const exists = await db.query.reports.findFirst({ where: eq(reports.id, reportId), columns: { id: true } });
    if (exists) return;
    const pdf = Buffer.from(`%PDF-1.7\n% matrix test report ${reportId} ${newId()}\n%%EOF\n`);
    const now = Date.now();
    await db.batch([
      db.update(calculations).set({ status: "issued", issuedAt: now, version: c.version + 1 }).where(eq(calculations.id, calcId)),
      db.insert(reports).values({
        id: reportId,
        workspaceId: c.workspaceId,
        projectId: c.projectId,
        calculationId: c.id,
        revision: c.revision,
        code: generateVerificationCode(),
        sha256: sha256Hex(pdf),
        pdf,
        snapshot: { calculation: { number: c.number, title: c.title }, engine: { typeId: c.typeId, version: c.engineVersion } },
        preparedByName: "Preparer",
        checkedByName: "Checker",
        approvedByName: "Approver",
        issuedBy: c.preparedBy,
        issuedAt: now,
      }),
    ]);
  });
}

function withReport(handler: unknown): Handler {
  return async (req, ctx) => {
    const params = await ctx.params;
    await seedReport(params.reportId ?? "");
    return (handler as Handler)(req, { params: Promise.resolve(params) });
  };
}

const report = (w: { slug: string; calcId: string }) => ({ slug: w.slug, reportId: `rep-${w.calcId}` });
const foreignReport = (w: { slug: string; otherCalcId: string }) => ({ slug: w.slug, reportId: `rep-${w.otherCalcId}` });

export const ROUTES: RouteCase[] = [
  {
    file: "app/api/w/[slug]/calculations/[calcId]/issue/route.ts",
    method: "POST",
    handler: issueRoute.POST,
    params: calc,
    body: () => ({ version: 1 }),
    // The world's calculation is a draft: allowed roles reach the state check (409), others 403.
    expect: { owner: 409, engineer: 403, checker: 409, client: 403 },
    foreignParams: foreignCalc,
  },
  { file: "app/api/w/[slug]/calculations/[calcId]/export/components/route.ts", method: "GET", handler: componentsRoute.GET, params: calc, expect: STAFF(200), foreignParams: foreignCalc },
  {
    file: "app/api/w/[slug]/calculations/[calcId]/export/netlist/route.ts",
    method: "GET",
    handler: netlistRoute.GET,
    params: calc,
    query: "?model=ideal",
    expect: STAFF(200),
    foreignParams: foreignCalc,
  },
  { file: "app/api/w/[slug]/calculations/[calcId]/export/json/route.ts", method: "GET", handler: jsonRoute.GET, params: calc, expect: STAFF(200), foreignParams: foreignCalc },
  {
    file: "app/api/w/[slug]/reports/route.ts",
    method: "GET",
    handler: reportsRoute.GET,
    params: (w) => ({ slug: w.slug }),
    query: (w) => `?projectId=${w.projectP}`,
    expect: EVERYONE(200),
  },
  { file: "app/api/w/[slug]/reports/[reportId]/route.ts", method: "GET", handler: withReport(reportRoute.GET), params: report, expect: EVERYONE(200), foreignParams: foreignReport },
  { file: "app/api/w/[slug]/reports/[reportId]/pdf/route.ts", method: "GET", handler: withReport(pdfRoute.GET), params: report, expect: EVERYONE(200), foreignParams: foreignReport },
];

/** Public routes, and the test that covers each. */
export const EXEMPT: Record<string, string> = {
  "app/api/verify/route.ts GET": "public verification by code, rate limited per IP; tests/integration/reports-verify.test.ts",
  "app/api/verify/route.ts POST": "public verification by upload, rate and size limited; tests/integration/reports-verify.test.ts",
};
