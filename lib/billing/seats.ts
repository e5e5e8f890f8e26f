/**
 * Seats: owners, engineers and checkers are billed seats; clients are free. A paid workspace
 * may not have more seat members (plus pending seat invitations) than it pays for.
 */
import { and, eq, gt, inArray, isNull, sql } from "drizzle-orm";
import { invitations, memberships, type Role, type Workspace } from "@/db/schema";
import type { Db } from "@/db/client";
import { read } from "@/db/write";
import { AppError } from "@/lib/errors";
import { SEAT_ROLES } from "@/lib/auth/permissions";

/** Trials may invite up to this many seats without paying. */
export const TRIAL_SEATS = 10;

export interface SeatUsage {
  /** Seat members now. */
  used: number;
  /** Pending (unexpired, unrevoked, unaccepted) invitations for seat roles. */
  pending: number;
  /** Seats the workspace may have: paid seats, or the trial allowance. */
  limit: number;
}

export async function seatUsage(ws: Workspace, db?: Db): Promise<SeatUsage> {
  const d = db ?? (await read());
  const now = Date.now();
  const [m] = await d
    .select({ n: sql<number>`count(*)` })
    .from(memberships)
    .where(and(eq(memberships.workspaceId, ws.id), inArray(memberships.role, [...SEAT_ROLES])));
  const [p] = await d
    .select({ n: sql<number>`count(*)` })
    .from(invitations)
    .where(
      and(
        eq(invitations.workspaceId, ws.id),
        inArray(invitations.role, [...SEAT_ROLES]),
        isNull(invitations.acceptedAt),
        isNull(invitations.revokedAt),
        gt(invitations.expiresAt, now),
      ),
    );
  const limit = ws.subscriptionStatus === "trialing" ? Math.max(TRIAL_SEATS, ws.seatsPaid) : ws.seatsPaid;
  return { used: Number(m?.n ?? 0), pending: Number(p?.n ?? 0), limit };
}

/**
 * Throws 409 seat_limit if one more seat (for `role`) would exceed the limit. Clients are free.
 * `countPending`: whether pending invitations count (they do when inviting; not when accepting,
 * because the accepted invitation was itself one of them).
 */
export async function assertSeatAvailable(ws: Workspace, role: Role, opts: { countPending: boolean; db?: Db }): Promise<void> {
  if (!SEAT_ROLES.includes(role)) return;
  const u = await seatUsage(ws, opts.db);
  const taken = u.used + (opts.countPending ? u.pending : 0);
  if (taken + 1 > u.limit) {
    throw new AppError(
      "seat_limit",
      `All ${u.limit} paid seat${u.limit === 1 ? " is" : "s are"} in use (${u.used} member${u.used === 1 ? "" : "s"}${u.pending ? `, ${u.pending} pending invitation${u.pending === 1 ? "" : "s"}` : ""}). Add seats on the billing page, or invite as a client (free).`,
      { fields: { role: "needs a free seat" } },
    );
  }
}
