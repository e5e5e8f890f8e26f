/**
 * Bringing a workspace's billing columns in line with its Stripe subscription.
 *
 * Stripe delivers webhooks at least once and in no particular order, so nothing here trusts an
 * event's payload: a sync re-fetches the subscription through the SDK and applies its current
 * state (`snapshotOf`), under three rules (`reconcile`):
 *
 * 1. Watermark: an event older than the last applied one (`subscriptionWatermark`, ms) is stale
 *    and ignored: the newer event's re-fetch already saw its effect.
 * 2. A cancelled subscription stays cancelled (Stripe never revives one); a fetch that started
 *    before the cancellation and commits after it cannot undo it.
 * 3. Another subscription that is not paying (ended, incomplete) never replaces the current one
 *    or a running trial: a stale event about an old subscription cannot lock out a paying
 *    customer.
 *
 * The event id is claimed in the same `db.batch` as the change (`commitSnapshot`), so a crash
 * leaves either both or neither; a repeat of a claimed id changes nothing.
 */
import { and, eq, lte, sql } from "drizzle-orm";
import type Stripe from "stripe";
import { stripeEvents, workspaces, type SubscriptionStatus, type Workspace } from "@/db/schema";
import type { Db } from "@/db/client";
import { read, write } from "@/db/write";
import { auditInsert } from "@/lib/audit";
import type { PackId } from "@/lib/calc/core/types";
import { accessState } from "./access";
import { billingSync } from "./lock";
import { PACK_IDS, planByLookupKey } from "./plans";
import { stripe } from "./stripe";

/** Stripe statuses in which the customer is paying (or in a Stripe trial). */
const PAYING: ReadonlySet<SubscriptionStatus> = new Set<SubscriptionStatus>(["active", "trialing", "past_due"]);
/** Statuses in which a subscription still exists to manage (seats, payment method). */
const MANAGEABLE: ReadonlySet<SubscriptionStatus> = new Set<SubscriptionStatus>(["active", "trialing", "past_due", "incomplete", "unpaid"]);

/** Whether the workspace has a Stripe subscription that has not ended. */
export function hasLiveSubscription(ws: Pick<Workspace, "stripeSubscriptionId" | "subscriptionStatus">): boolean {
  return ws.stripeSubscriptionId != null && MANAGEABLE.has(ws.subscriptionStatus);
}

/** A subscription as our columns see it. Times in ms since the epoch. */
export interface SubscriptionSnapshot {
  subscriptionId: string;
  customerId: string;
  status: SubscriptionStatus;
  /** Packs the subscription's item prices unlock. */
  packs: PackId[];
  /** Paid seats: the smallest item quantity (every item carries the seat count). */
  seats: number;
  currentPeriodEnd: number | null;
  cancelAtPeriodEnd: boolean;
  trialEndsAt: number | null;
}

/** Stripe's subscription status in our closed set. */
export function mapStatus(status: Stripe.Subscription.Status): SubscriptionStatus {
  switch (status) {
    case "active":
      return "active";
    case "trialing":
      return "trialing";
    case "past_due":
      return "past_due";
    case "canceled":
      return "canceled";
    case "unpaid":
      return "unpaid";
    case "incomplete":
      return "incomplete";
    case "incomplete_expired":
      return "canceled";
    default:
      // "paused": a trial ended without a payment method; no access until it is paid.
      return "unpaid";
  }
}

function packsOfPrice(price: Stripe.Price): PackId[] {
  const plan = planByLookupKey(price.lookup_key);
  if (plan) return [...plan.packs];
  // A price whose lookup key moved on (an old amount) still names its packs in metadata.
  const listed = (price.metadata?.packs ?? "").split(",").map((s) => s.trim());
  return PACK_IDS.filter((p) => listed.includes(p));
}

/** The columns a Stripe subscription object implies. */
export function snapshotOf(sub: Stripe.Subscription): SubscriptionSnapshot {
  const items = sub.items.data;
  const packs = new Set<PackId>();
  for (const item of items) for (const p of packsOfPrice(item.price)) packs.add(p);
  const quantities = items.map((i) => i.quantity ?? 1);
  const ends = items.map((i) => i.current_period_end).filter((t): t is number => typeof t === "number");
  const status = mapStatus(sub.status);
  return {
    subscriptionId: sub.id,
    customerId: typeof sub.customer === "string" ? sub.customer : sub.customer.id,
    status,
    packs: PACK_IDS.filter((p) => packs.has(p)),
    seats: quantities.length ? Math.min(...quantities) : 0,
    currentPeriodEnd: ends.length ? Math.max(...ends) * 1000 : null,
    cancelAtPeriodEnd: sub.cancel_at_period_end || (status !== "canceled" && sub.cancel_at != null),
    trialEndsAt: sub.trial_end ? sub.trial_end * 1000 : null,
  };
}

/** The billing columns a sync writes. */
export type BillingPatch = Pick<
  Workspace,
  "stripeSubscriptionId" | "subscriptionStatus" | "packs" | "seatsPaid" | "currentPeriodEnd" | "cancelAtPeriodEnd" | "pastDueSince" | "trialEndsAt" | "subscriptionWatermark"
> & { stripeCustomerId?: string };

export type Decision = { kind: "apply"; patch: BillingPatch } | { kind: "stale" | "ignore"; reason: string };

/**
 * What applying `snap` to `ws` should do. `eventCreatedMs`: the `created` (ms) of the event that
 * asked for the sync, or null for a sync of our own (after checkout, a seat change): those never
 * move the watermark. `now` in ms.
 */
export function reconcile(ws: Workspace, snap: SubscriptionSnapshot, opts: { eventCreatedMs: number | null; now: number }): Decision {
  const created = opts.eventCreatedMs;
  if (created != null && created < ws.subscriptionWatermark) {
    return { kind: "stale", reason: "older than the last applied event" };
  }
  const same = ws.stripeSubscriptionId === snap.subscriptionId;
  if (same && ws.subscriptionStatus === "canceled" && snap.status !== "canceled") {
    return { kind: "ignore", reason: "a cancelled subscription stays cancelled" };
  }
  if (!same && !PAYING.has(snap.status)) {
    if (hasLiveSubscription(ws)) return { kind: "ignore", reason: "not the workspace's current subscription" };
    if (accessState(ws, opts.now).mode !== "read_only") return { kind: "ignore", reason: "a subscription that is not paying does not end a running trial" };
  }
  const stillPastDue = same && ws.subscriptionStatus === "past_due" && ws.pastDueSince != null;
  const patch: BillingPatch = {
    stripeSubscriptionId: snap.subscriptionId,
    subscriptionStatus: snap.status,
    packs: snap.packs,
    seatsPaid: snap.seats,
    currentPeriodEnd: snap.currentPeriodEnd,
    cancelAtPeriodEnd: snap.cancelAtPeriodEnd,
    pastDueSince: snap.status === "past_due" ? (stillPastDue ? ws.pastDueSince : Math.min(created ?? opts.now, opts.now)) : null,
    trialEndsAt: snap.status === "trialing" ? snap.trialEndsAt : ws.trialEndsAt,
    subscriptionWatermark: created != null ? Math.max(ws.subscriptionWatermark, created) : ws.subscriptionWatermark,
  };
  if (ws.stripeCustomerId == null) patch.stripeCustomerId = snap.customerId;
  return { kind: "apply", patch };
}

/** Names of the columns `patch` changes (the watermark alone does not count). */
export function changedFields(ws: Workspace, patch: BillingPatch): string[] {
  const out: string[] = [];
  for (const [k, v] of Object.entries(patch)) {
    if (k === "subscriptionWatermark") continue;
    if (JSON.stringify(ws[k as keyof Workspace]) !== JSON.stringify(v)) out.push(k);
  }
  return out;
}

/** The Stripe event a sync answers, for the dedupe claim. */
export interface EventRef {
  id: string;
  type: string;
  /** The event's `created`, ms. */
  createdMs: number;
}

export type SyncOutcome = "applied" | "unchanged" | "stale" | "ignored" | "duplicate";

export interface SyncResult {
  outcome: SyncOutcome;
  reason?: string;
}

type Stmt = Parameters<Db["batch"]>[0][number];

async function batch(db: Db, stmts: Stmt[]): Promise<void> {
  if (stmts.length === 0) return;
  await db.batch(stmts as [Stmt, ...Stmt[]]);
}

async function eventClaimed(db: Db, id: string): Promise<boolean> {
  const row = await db.query.stripeEvents.findFirst({ where: eq(stripeEvents.id, id), columns: { id: true } });
  return row !== undefined;
}

/** Whether this Stripe event id has already been applied (or deliberately ignored). */
export async function isEventClaimed(id: string): Promise<boolean> {
  return eventClaimed(await read(), id);
}

/**
 * Applies `snapshot` to the workspace and claims `event` (if any), in one atomic batch. With no
 * workspace or no snapshot, only the claim is written (the event is acknowledged and ignored).
 * A claimed event id answers "duplicate" and changes nothing.
 */
export async function commitSnapshot(args: {
  workspaceId: string | null;
  snapshot: SubscriptionSnapshot | null;
  event?: EventRef;
  /** Who caused a sync of our own (null for Stripe's events). */
  actorId?: string | null;
  reason?: string;
  now?: number;
}): Promise<SyncResult> {
  const now = args.now ?? Date.now();
  const ev = args.event;
  return write(async (db) => {
    if (ev && (await eventClaimed(db, ev.id))) return { outcome: "duplicate" };
    const claim: Stmt[] = ev ? [db.insert(stripeEvents).values({ id: ev.id, type: ev.type, createdAt: ev.createdMs, receivedAt: now })] : [];
    const ws = args.workspaceId ? await db.query.workspaces.findFirst({ where: eq(workspaces.id, args.workspaceId) }) : undefined;
    const run = async (stmts: Stmt[], result: SyncResult): Promise<SyncResult> => {
      try {
        await batch(db, stmts);
      } catch (err) {
        // Another process claimed the same event between our check and our batch.
        if (ev && (await eventClaimed(db, ev.id))) return { outcome: "duplicate" };
        throw err;
      }
      return result;
    };
    if (!ws || !args.snapshot) return run(claim, { outcome: "ignored", reason: args.reason ?? "no workspace for this subscription" });
    const snap = args.snapshot;
    const d = reconcile(ws, snap, { eventCreatedMs: ev?.createdMs ?? null, now });
    if (d.kind !== "apply") return run(claim, { outcome: d.kind === "stale" ? "stale" : "ignored", reason: d.reason });

    const changed = changedFields(ws, d.patch);
    const conditions = [eq(workspaces.id, ws.id)];
    // Across processes: never go behind a newer event, never revive a cancelled subscription.
    if (ev) conditions.push(lte(workspaces.subscriptionWatermark, ev.createdMs));
    if (snap.status !== "canceled") {
      conditions.push(sql`not (coalesce(${workspaces.stripeSubscriptionId}, '') = ${snap.subscriptionId} and ${workspaces.subscriptionStatus} = 'canceled')`);
    }
    const stmts: Stmt[] = [...claim, db.update(workspaces).set(d.patch).where(and(...conditions))];
    if (changed.length > 0) {
      stmts.push(
        auditInsert(db, {
          workspaceId: ws.id,
          actorId: args.actorId ?? null,
          action: "billing.subscription_synced",
          targetType: "workspace",
          targetId: ws.id,
          data: {
            source: ev ? ev.type : (args.reason ?? "sync"),
            eventId: ev?.id ?? null,
            subscriptionId: snap.subscriptionId,
            status: snap.status,
            packs: snap.packs,
            seatsPaid: snap.seats,
            changed,
          },
        }),
      );
    }
    return run(stmts, { outcome: changed.length > 0 ? "applied" : "unchanged" });
  });
}

/**
 * The workspace a Stripe object belongs to: the one that holds the customer id, else the one
 * named in metadata (workspaceId) as long as it has no other customer. Undefined when neither.
 */
export async function findBillingWorkspace(hint: { customerId: string | null; workspaceId: string | null }): Promise<Workspace | undefined> {
  const db = await read();
  if (hint.customerId) {
    const byCustomer = await db.query.workspaces.findFirst({ where: eq(workspaces.stripeCustomerId, hint.customerId) });
    if (byCustomer) return byCustomer;
  }
  if (hint.workspaceId) {
    const named = await db.query.workspaces.findFirst({ where: eq(workspaces.id, hint.workspaceId) });
    if (named && (named.stripeCustomerId == null || named.stripeCustomerId === hint.customerId)) return named;
  }
  return undefined;
}

/** Fetches the subscription through the SDK (throws the SDK's errors unchanged). */
export async function fetchSnapshot(subscriptionId: string): Promise<SubscriptionSnapshot> {
  return snapshotOf(await stripe().subscriptions.retrieve(subscriptionId));
}

/**
 * Re-fetch one subscription and apply it, in order with every other billing sync of this
 * process. `event`: the Stripe event that asked for it (claimed in the same batch).
 */
export function syncSubscription(args: { workspaceId: string; subscriptionId: string; event?: EventRef; actorId?: string | null; reason?: string }): Promise<SyncResult> {
  return billingSync(async () => {
    const snapshot = await fetchSnapshot(args.subscriptionId);
    return commitSnapshot({ workspaceId: args.workspaceId, snapshot, event: args.event, actorId: args.actorId, reason: args.reason });
  });
}

/**
 * Make a change through the SDK (`change` returns the updated subscription) and apply its answer,
 * inside the same billing-sync turn, so no other sync of this process can slip between the
 * change and its write.
 */
export function changeSubscription(args: {
  workspaceId: string;
  change: (s: Stripe) => Promise<Stripe.Subscription>;
  actorId?: string | null;
  reason: string;
}): Promise<SyncResult> {
  return billingSync(async () => {
    const sub = await args.change(stripe());
    return commitSnapshot({ workspaceId: args.workspaceId, snapshot: snapshotOf(sub), actorId: args.actorId, reason: args.reason });
  });
}
