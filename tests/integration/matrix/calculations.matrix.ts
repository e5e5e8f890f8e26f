/** Calculation routes in the permission matrix (see ../permission-matrix.test.ts). */
import type { RouteCase } from "../permission-matrix.test";
import * as listRoute from "@/app/api/w/[slug]/projects/[projectId]/calculations/route";
import * as calcRoute from "@/app/api/w/[slug]/calculations/[calcId]/route";
import * as transitionsRoute from "@/app/api/w/[slug]/calculations/[calcId]/transitions/route";
import * as historyRoute from "@/app/api/w/[slug]/calculations/[calcId]/history/route";
import * as compareRoute from "@/app/api/w/[slug]/calculations/[calcId]/compare/route";
import * as commentsRoute from "@/app/api/w/[slug]/calculations/[calcId]/comments/route";
import * as computeRoute from "@/app/api/w/[slug]/compute/route";
import * as screenRoute from "@/app/api/w/[slug]/screen/route";

const STAFF = (ok: number) => ({ owner: ok, engineer: ok, checker: ok, client: 403 });
const calc = (w: { slug: string; calcId: string }) => ({ slug: w.slug, calcId: w.calcId });
const foreignCalc = (w: { slug: string; otherCalcId: string }) => ({ slug: w.slug, calcId: w.otherCalcId });

export const ROUTES: RouteCase[] = [
  {
    file: "app/api/w/[slug]/projects/[projectId]/calculations/route.ts",
    method: "GET",
    handler: listRoute.GET,
    params: (w) => ({ slug: w.slug, projectId: w.projectP }),
    expect: STAFF(200),
    foreignParams: (w) => ({ slug: w.slug, projectId: w.otherProject }),
  },
  {
    file: "app/api/w/[slug]/projects/[projectId]/calculations/route.ts",
    method: "POST",
    handler: listRoute.POST,
    params: (w) => ({ slug: w.slug, projectId: w.projectP }),
    body: () => ({ typeId: "filter.lowpass", title: "Anti-alias filter" }),
    expect: STAFF(201),
    foreignParams: (w) => ({ slug: w.slug, projectId: w.otherProject }),
  },
  { file: "app/api/w/[slug]/calculations/[calcId]/route.ts", method: "GET", handler: calcRoute.GET, params: calc, expect: STAFF(200), foreignParams: foreignCalc },
  {
    file: "app/api/w/[slug]/calculations/[calcId]/route.ts",
    method: "PATCH",
    handler: calcRoute.PATCH,
    params: calc,
    body: () => ({ version: 1, title: "Renamed" }),
    expect: STAFF(200),
    foreignParams: foreignCalc,
  },
  {
    file: "app/api/w/[slug]/calculations/[calcId]/transitions/route.ts",
    method: "POST",
    handler: transitionsRoute.POST,
    params: calc,
    body: (w) => ({ action: "submit", version: 1, checkerId: w.checker.id }),
    expect: STAFF(200),
    foreignParams: foreignCalc,
  },
  { file: "app/api/w/[slug]/calculations/[calcId]/history/route.ts", method: "GET", handler: historyRoute.GET, params: calc, expect: STAFF(200), foreignParams: foreignCalc },
  {
    file: "app/api/w/[slug]/calculations/[calcId]/compare/route.ts",
    method: "GET",
    handler: compareRoute.GET,
    params: calc,
    query: (w) => `?a=${w.historyId}&b=${w.historyId}`,
    expect: STAFF(200),
    foreignParams: foreignCalc,
  },
  { file: "app/api/w/[slug]/calculations/[calcId]/comments/route.ts", method: "GET", handler: commentsRoute.GET, params: calc, expect: STAFF(200), foreignParams: foreignCalc },
  {
    file: "app/api/w/[slug]/calculations/[calcId]/comments/route.ts",
    method: "POST",
    handler: commentsRoute.POST,
    params: calc,
    body: () => ({ body: "Please add the load capacitance." }),
    expect: STAFF(201),
    foreignParams: foreignCalc,
  },
  {
    file: "app/api/w/[slug]/compute/route.ts",
    method: "POST",
    handler: computeRoute.POST,
    params: (w) => ({ slug: w.slug }),
    body: () => ({ typeId: "filter.lowpass", inputs: { order: 2, cutoff: "1k" } }),
    // Inputs incomplete on purpose: allowed roles get 422 naming the missing fields, others 403.
    expect: STAFF(422),
  },
  {
    file: "app/api/w/[slug]/screen/route.ts",
    method: "POST",
    handler: screenRoute.POST,
    params: (w) => ({ slug: w.slug }),
    body: () => ({ typeId: "filter.lowpass", inputs: {} }),
    expect: STAFF(200),
  },
];
