/**
 * Seats: owners, engineers and checkers are billed seats; clients are free. A paid workspace
 * may not have more seat members (plus pending seat invitations) than it pays for. The owner
 * changes the number of paid seats with `changeSeats` (the subscription items' quantity).
 */
import { and, eq, gt, inArray, isNull, sql } from "drizzle-orm";
import type { z } from "zod";
import { invitations, memberships, type Role, type Workspace } from "@/db/schema";
import type { Db } from "@/db/client";
import { read } from "@/db/write";
import { AppError } from "@/lib/errors";
import { SEAT_ROLES } from "@/lib/auth/permissions";
import type { WorkspaceContext } from "@/lib/auth/guard";
import { changeSeatsSchema, seatsSchema } from "./schemas";
import { stripeFailure } from "./stripe";
import { changeSubscription, hasLiveSubscription, type SyncResult } from "./subscription";

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

/** Seat usage of a workspace (members and pending invitations of seat roles, and the limit). */
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

export { changeSeatsSchema, seatsSchema };

/** Throws 422 (field `seats`) when `seats` is fewer than the workspace's seat members now. */
export async function assertSeatsCoverMembers(ws: Workspace, seats: number, db?: Db): Promise<SeatUsage> {
  const u = await seatUsage(ws, db);
  if (seats < u.used) {
    throw new AppError(
      "invalid_input",
      `The workspace has ${u.used} seat member${u.used === 1 ? "" : "s"} (owners, engineers and checkers), so it needs at least ${u.used} seat${u.used === 1 ? "" : "s"}. Remove members or make them clients (free) first.`,
      { fields: { seats: `must be at least ${u.used}, the number of seat members` } },
    );
  }
  return u;
}

/**
 * Sets the paid seats of the workspace's subscription to `seats` (every item's quantity, with
 * prorations). Refuses with a clear message when there is no live subscription or when `seats`
 * is fewer than the seat members. The answer from Stripe is applied at once; the webhook that
 * follows finds nothing left to change.
 */
export async function changeSeats(ctx: WorkspaceContext, input: z.output<typeof changeSeatsSchema>): Promise<{ seatsPaid: number; result: SyncResult }> {
  const ws = ctx.workspace;
  if (!hasLiveSubscription(ws) || !ws.stripeSubscriptionId) {
    throw new AppError("conflict", "This workspace has no subscription to add seats to yet. Choose packs and seats under Subscribe first.");
  }
  await assertSeatsCoverMembers(ws, input.seats);
  if (input.seats === ws.seatsPaid) return { seatsPaid: ws.seatsPaid, result: { outcome: "unchanged" } };
  const subscriptionId = ws.stripeSubscriptionId;
  try {
    const result = await changeSubscription({
      workspaceId: ws.id,
      actorId: ctx.user.id,
      reason: "seats_changed",
      change: async (s) => {
        const sub = await s.subscriptions.retrieve(subscriptionId);
        if (sub.status === "canceled" || sub.status === "incomplete_expired") {
          throw new AppError("conflict", "The subscription has ended, so its seats cannot change. Subscribe again to continue.");
        }
        return s.subscriptions.update(subscriptionId, {
          items: sub.items.data.map((item) => ({ id: item.id, quantity: input.seats })),
          proration_behavior: "create_prorations",
        });
      },
    });
    return { seatsPaid: input.seats, result };
  } catch (err) {
    throw stripeFailure("change the number of seats", err);
  }
}
