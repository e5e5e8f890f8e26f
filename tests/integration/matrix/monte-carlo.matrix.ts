/** The streaming Monte Carlo route in the permission matrix (see ../permission-matrix.test.ts). */
import type { RouteCase } from "../permission-matrix.test";
import * as monteCarloRoute from "@/app/api/w/[slug]/monte-carlo/route";
import { getCalcType } from "@/lib/calc/registry";

const STAFF = (ok: number) => ({ owner: ok, engineer: ok, checker: ok, client: 403 });

export const ROUTES: RouteCase[] = [
  {
    file: "app/api/w/[slug]/monte-carlo/route.ts",
    method: "POST",
    handler: monteCarloRoute.POST,
    params: (w) => ({ slug: w.slug }),
    // A small N keeps the matrix fast; staff get the 200 stream, clients 403 before any work.
    body: () => ({ typeId: "filter.lowpass", inputs: getCalcType("filter.lowpass")!.defaults, trials: 200 }),
    expect: STAFF(200),
  },
];
