/**
 * Parts library and attachment routes in the permission matrix (see ../permission-matrix.test.ts).
 *
 * The world has no parts or attachments, so ids name their fixture: "mx-part-<workspaceId>" and
 * "mx-att-<workspaceId>" are created in that workspace just before the handler runs (the
 * foreign variants in the other workspace). The upload case sends a real PNG as multipart, as a
 * browser would, instead of the matrix's JSON body.
 */
import type { RouteCase } from "../permission-matrix.test";
import type { World } from "../helpers";
import { insertPart } from "../parts/fixtures";
import { insertAttachment, makePng, uploadRequest } from "../attachments/files";
import { templateCsv } from "@/lib/parts/csv";
import * as partsRoute from "@/app/api/w/[slug]/parts/route";
import * as partRoute from "@/app/api/w/[slug]/parts/[partId]/route";
import * as templateRoute from "@/app/api/w/[slug]/parts/template/route";
import * as exportRoute from "@/app/api/w/[slug]/parts/export/route";
import * as importRoute from "@/app/api/w/[slug]/parts/import/route";
import * as starterRoute from "@/app/api/w/[slug]/parts/starter/route";
import * as attachmentsRoute from "@/app/api/w/[slug]/calculations/[calcId]/attachments/route";
import * as attachmentRoute from "@/app/api/w/[slug]/calculations/[calcId]/attachments/[attachmentId]/route";

type Params = Record<string, string>;
type Handler = (req: Request, ctx: { params: Promise<Params> }) => Promise<Response>;

const STAFF = (ok: number) => ({ owner: ok, engineer: ok, checker: ok, client: 403 });

/** Create the fixtures the params name, then call the real handler. */
function withFixtures(h: unknown, opts: { upload?: boolean } = {}): Handler {
  return async (req, ctx) => {
    const params = await ctx.params;
    if (params.partId?.startsWith("mx-part-")) await insertPart(params.partId, params.partId.slice("mx-part-".length));
    if (params.attachmentId?.startsWith("mx-att-")) await insertAttachment(params.attachmentId, params.attachmentId.slice("mx-att-".length));
    let r = req;
    if (opts.upload) r = uploadRequest({ name: "schematic.png", bytes: makePng(), cookie: req.headers.get("cookie") ?? undefined, browserType: "image/png" });
    return (h as Handler)(r, { params: Promise.resolve(params) });
  };
}

const ws = (w: World) => ({ slug: w.slug });
const part = (w: World) => ({ slug: w.slug, partId: `mx-part-${w.workspaceId}` });
const foreignPart = (w: World) => ({ slug: w.slug, partId: `mx-part-${w.otherWorkspaceId}` });
const calc = (w: World) => ({ slug: w.slug, calcId: w.calcId });
const foreignCalc = (w: World) => ({ slug: w.slug, calcId: w.otherCalcId });
const att = (w: World) => ({ slug: w.slug, calcId: w.calcId, attachmentId: `mx-att-${w.workspaceId}` });
const foreignAtt = (w: World) => ({ slug: w.slug, calcId: w.calcId, attachmentId: `mx-att-${w.otherWorkspaceId}` });

const F = {
  parts: "app/api/w/[slug]/parts/route.ts",
  part: "app/api/w/[slug]/parts/[partId]/route.ts",
  template: "app/api/w/[slug]/parts/template/route.ts",
  export: "app/api/w/[slug]/parts/export/route.ts",
  import: "app/api/w/[slug]/parts/import/route.ts",
  attachments: "app/api/w/[slug]/calculations/[calcId]/attachments/route.ts",
  attachment: "app/api/w/[slug]/calculations/[calcId]/attachments/[attachmentId]/route.ts",
};

export const ROUTES: RouteCase[] = [
  { file: "app/api/w/[slug]/parts/starter/route.ts", method: "POST", handler: starterRoute.POST, params: ws, body: () => ({ kind: "opamp" }), expect: STAFF(201) },
  { file: F.parts, method: "GET", handler: partsRoute.GET, params: ws, query: "?kind=opamp", expect: STAFF(200) },
  {
    file: F.parts,
    method: "POST",
    handler: partsRoute.POST,
    params: ws,
    body: () => ({ kind: "opamp", name: "LW-OA999 matrix", values: { supplyMin: "2.7", supplyMax: "5.5", gbw: "10M", slewRate: "8 V/µs", aolDb: "110", vos: "1m", vosDrift: "2u", ib: "10p", ios: "5p", en: "12n", in: "3f", enCorner: "1k", vicmNeg: "-0.1", vicmPos: "-0.1", swingNeg: "50m", swingPos: "50m", swingLoad: "2k", ioutMax: "40m", rout: "100" } }),
    expect: STAFF(201),
  },
  { file: F.part, method: "GET", handler: withFixtures(partRoute.GET), params: part, expect: STAFF(200), foreignParams: foreignPart },
  { file: F.part, method: "PATCH", handler: withFixtures(partRoute.PATCH), params: part, body: () => ({ notes: "checked against the data sheet" }), expect: STAFF(200), foreignParams: foreignPart },
  { file: F.part, method: "DELETE", handler: withFixtures(partRoute.DELETE), params: part, expect: STAFF(200), foreignParams: foreignPart },
  { file: F.template, method: "GET", handler: templateRoute.GET, params: ws, query: "?kind=reference", expect: STAFF(200) },
  { file: F.export, method: "GET", handler: exportRoute.GET, params: ws, query: "?kind=opamp", expect: STAFF(200) },
  // Preview of the template: allowed roles get 200 and nothing is written.
  { file: F.import, method: "POST", handler: importRoute.POST, params: ws, body: () => ({ kind: "opamp", csv: templateCsv("opamp") }), expect: STAFF(200) },
  { file: F.attachments, method: "GET", handler: attachmentsRoute.GET, params: calc, expect: STAFF(200), foreignParams: foreignCalc },
  { file: F.attachments, method: "POST", handler: withFixtures(attachmentsRoute.POST, { upload: true }), params: calc, expect: STAFF(201), foreignParams: foreignCalc },
  { file: F.attachment, method: "GET", handler: withFixtures(attachmentRoute.GET), params: att, expect: STAFF(200), foreignParams: foreignAtt },
  { file: F.attachment, method: "DELETE", handler: withFixtures(attachmentRoute.DELETE), params: att, expect: STAFF(200), foreignParams: foreignAtt },
];
