/**
 * The permission matrix: which workspace role may do which action. Declared once, here; every
 * route handler, server action and page asks `can()` (through lib/auth/guard.ts).
 *
 * Object-level rules live beside it: a client sees only the projects shared with them and only
 * issued reports (see `clientProjectScoped`), and nobody checks or approves their own work
 * (enforced by the workflow in lib/calculations).
 */
import type { Role } from "@/db/schema";

export const ACTIONS = [
  "workspace.view",
  "workspace.update",
  "members.view",
  "members.manage",
  "team.list",
  "billing.view",
  "billing.manage",
  "project.view",
  "project.create",
  "project.update",
  "project.share",
  "calc.view",
  "calc.create",
  "calc.edit",
  "calc.submit",
  "calc.review",
  "calc.issue",
  "parts.view",
  "parts.manage",
  "report.view",
  "audit.view",
] as const;

export type Action = (typeof ACTIONS)[number];

const STAFF: Role[] = ["owner", "engineer", "checker"];
const REVIEWERS: Role[] = ["owner", "checker"];
const EVERYONE: Role[] = ["owner", "engineer", "checker", "client"];
const OWNER: Role[] = ["owner"];

/** Role → allowed actions. Owner: everything. Checker: engineer + review and issue. Client: view shared. */
const MATRIX: Record<Action, Role[]> = {
  "workspace.view": EVERYONE,
  "workspace.update": OWNER,
  "members.view": OWNER,
  "members.manage": OWNER,
  "team.list": STAFF, // e.g. picking a checker
  "billing.view": OWNER,
  "billing.manage": OWNER,
  "project.view": EVERYONE, // clients: shared projects only
  "project.create": STAFF,
  "project.update": STAFF, // rename, archive
  "project.share": OWNER, // give a client access to a project
  "calc.view": STAFF,
  "calc.create": STAFF,
  "calc.edit": STAFF,
  "calc.submit": STAFF,
  "calc.review": REVIEWERS, // return to draft, approve
  "calc.issue": REVIEWERS,
  "parts.view": STAFF,
  "parts.manage": STAFF,
  "report.view": EVERYONE, // clients: issued reports of shared projects only
  "audit.view": OWNER,
};

/** May `role` perform `action`? */
export function can(role: Role, action: Action): boolean {
  return MATRIX[action].includes(role);
}

/** The roles that may perform `action` (for documentation and tests). */
export function rolesFor(action: Action): readonly Role[] {
  return MATRIX[action];
}

/** Roles whose members count as billed seats. Clients never do. */
export const SEAT_ROLES: readonly Role[] = STAFF;

/** Whether a role's project visibility is limited to projects explicitly shared with it. */
export function clientProjectScoped(role: Role): boolean {
  return role === "client";
}
