/**
 * The role matrix against the roles table of the product design (DESIGN.md, "Who uses it"):
 * owner — everything, billing, members, signing key; engineer — create/edit calculations, submit
 * for check, manage parts library; checker — everything an engineer may, plus check, return and
 * approve; client — see shared projects, download issued reports, nothing else.
 */
import { describe, expect, it } from "vitest";
import { ACTIONS, can, SEAT_ROLES } from "@/lib/auth/permissions";

describe("permission matrix", () => {
  it("gives the owner every action", () => {
    for (const a of ACTIONS) expect(can("owner", a), a).toBe(true);
  });

  it("gives the checker everything the engineer may, plus review and issue", () => {
    for (const a of ACTIONS) if (can("engineer", a)) expect(can("checker", a), a).toBe(true);
    expect(can("engineer", "calc.review")).toBe(false);
    expect(can("checker", "calc.review")).toBe(true);
    expect(can("engineer", "calc.issue")).toBe(false);
    expect(can("checker", "calc.issue")).toBe(true);
  });

  it("keeps members, billing and the audit log to owners", () => {
    for (const r of ["engineer", "checker", "client"] as const) {
      for (const a of ["members.view", "members.manage", "billing.view", "billing.manage", "audit.view"] as const) expect(can(r, a), `${r} ${a}`).toBe(false);
    }
  });

  it("lets a client only see projects and reports", () => {
    const allowed = ACTIONS.filter((a) => can("client", a)).sort();
    expect(allowed).toEqual(["project.view", "report.view", "workspace.view"]);
  });

  it("lets engineers work on calculations and parts", () => {
    for (const a of ["calc.create", "calc.edit", "calc.submit", "parts.manage", "project.create"] as const) expect(can("engineer", a), a).toBe(true);
  });

  it("bills owners, engineers and checkers, never clients", () => {
    expect([...SEAT_ROLES].sort()).toEqual(["checker", "engineer", "owner"]);
  });
});
