/**
 * Webhook delivery: each event is POSTed to the configured endpoint with Stripe's signature
 * header, first attempts in order of creation, one at a time; a non-2xx answer (or a network
 * error) is retried after a short backoff, and later events are not held back meanwhile (so a
 * retried event can arrive after newer ones, as with Stripe). Every attempt is logged.
 */
import { createHmac } from "node:crypto";
import type { WEventBase } from "./types";

/** The `Stripe-Signature` header for `body` signed with `secret` at `t` (Unix s). */
export function signatureHeader(body: string, secret: string, t: number): string {
  const v1 = createHmac("sha256", secret).update(`${t}.${body}`, "utf8").digest("hex");
  return `t=${t},v1=${v1}`;
}

/** One POST of an event to the endpoint. */
export interface DeliveryAttempt {
  /** Unix ms when the attempt started. */
  at: number;
  /** HTTP status, or null on a network error / timeout. */
  status: number | null;
  ok: boolean;
  error?: string;
  /** Round-trip time, ms. */
  durationMs: number;
  /** True for a manual redelivery (POST /_fake/events/:id/redeliver). */
  manual: boolean;
  url: string;
}

/** Delivery state of one event. */
export interface DeliveryRecord {
  eventId: string;
  type: string;
  /** pending (queued / retrying), delivered, failed (retries exhausted), no_endpoint (none configured). */
  status: "pending" | "delivered" | "failed" | "no_endpoint";
  attempts: DeliveryAttempt[];
}

interface QueueEntry {
  eventId: string;
  seq: number;
  attempt: number;
  /** Unix ms when the entry is due. */
  dueAt: number;
}

export interface DeliveryOptions {
  url?: string;
  secret?: string;
  /** Waits before retries 1, 2, …, ms; the number of entries is the number of retries. */
  retryDelaysMs: number[];
  /** Per-attempt timeout, ms. */
  timeoutMs: number;
  /** Looks up the event to send (the stored object, sent as it is at sending time). */
  getEvent: (id: string) => WEventBase | undefined;
  /** Called when an event's first successful delivery happens. */
  onDelivered: (id: string) => void;
  /** Called after every attempt (for logging). */
  onAttempt?: (id: string, attempt: DeliveryAttempt) => void;
}

/** The delivery queue and its log. */
export class WebhookDeliverer {
  private queue: QueueEntry[] = [];
  private seq = 0;
  private running = false;
  private paused = false;
  private timer: NodeJS.Timeout | null = null;
  private closed = false;
  private idleWaiters: (() => void)[] = [];
  readonly log = new Map<string, DeliveryRecord>();

  constructor(private opts: DeliveryOptions) {}

  get url(): string | undefined {
    return this.opts.url;
  }

  get secret(): string | undefined {
    return this.opts.secret;
  }

  get isPaused(): boolean {
    return this.paused;
  }

  get pendingCount(): number {
    return this.queue.length + (this.running ? 1 : 0);
  }

  /** Changes the endpoint and/or secret (undefined keeps the current value). */
  configure(url: string | undefined, secret: string | undefined): void {
    if (url !== undefined) this.opts.url = url || undefined;
    if (secret !== undefined) this.opts.secret = secret || undefined;
  }

  /** Queues a new event for its first delivery. */
  enqueue(event: WEventBase): void {
    if (!this.opts.url || !this.opts.secret) {
      this.log.set(event.id, { eventId: event.id, type: event.type, status: "no_endpoint", attempts: [] });
      return;
    }
    this.log.set(event.id, { eventId: event.id, type: event.type, status: "pending", attempts: [] });
    this.queue.push({ eventId: event.id, seq: ++this.seq, attempt: 0, dueAt: Date.now() });
    this.kick();
  }

  /** Stops automatic delivery; queued events wait until resume(). */
  pause(): void {
    this.paused = true;
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
  }

  /** Restarts automatic delivery of queued events (in order). */
  resume(): void {
    this.paused = false;
    this.kick();
  }

  /** Drops every queued delivery (their records become failed with no further attempts). */
  clear(): void {
    for (const q of this.queue) {
      const rec = this.log.get(q.eventId);
      if (rec && rec.status === "pending") rec.status = "failed";
    }
    this.queue = [];
    this.notifyIdle();
  }

  /** Forgets the log and the queue (for a reset). */
  reset(): void {
    this.queue = [];
    this.log.clear();
    this.notifyIdle();
  }

  /** POSTs `eventId` now, outside the queue (even while paused): a duplicate on purpose. */
  async redeliver(eventId: string): Promise<DeliveryAttempt> {
    const attempt = await this.post(eventId, true);
    return attempt;
  }

  /**
   * Resolves true once nothing is queued or in flight, false after `timeoutMs`. While paused
   * with events queued it waits for a resume (or the timeout).
   */
  idle(timeoutMs = 10_000): Promise<boolean> {
    if (this.pendingCount === 0) return Promise.resolve(true);
    return new Promise((resolve) => {
      const done = () => {
        clearTimeout(t);
        resolve(true);
      };
      const t = setTimeout(() => {
        this.idleWaiters = this.idleWaiters.filter((w) => w !== done);
        resolve(false);
      }, timeoutMs);
      this.idleWaiters.push(done);
    });
  }

  /** Stops timers; queued deliveries are abandoned. */
  close(): void {
    this.closed = true;
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.notifyIdle();
  }

  private notifyIdle(): void {
    if (this.pendingCount > 0) return;
    const waiters = this.idleWaiters;
    this.idleWaiters = [];
    for (const w of waiters) w();
  }

  private kick(): void {
    if (this.running || this.paused || this.closed) return;
    void this.pump();
  }

  private async pump(): Promise<void> {
    if (this.running) return;
    this.running = true;
    try {
      while (!this.paused && !this.closed && this.queue.length > 0) {
        const now = Date.now();
        const due = this.queue.filter((q) => q.dueAt <= now).sort((a, b) => a.dueAt - b.dueAt || a.seq - b.seq)[0];
        if (!due) {
          const next = Math.min(...this.queue.map((q) => q.dueAt));
          if (this.timer) clearTimeout(this.timer);
          this.timer = setTimeout(() => {
            this.timer = null;
            this.kick();
          }, Math.max(1, next - now));
          break;
        }
        this.queue = this.queue.filter((q) => q !== due);
        const result = await this.post(due.eventId, false);
        const rec = this.log.get(due.eventId);
        if (!rec || result.ok || rec.status === "delivered") continue;
        if (due.attempt < this.opts.retryDelaysMs.length) {
          this.queue.push({ eventId: due.eventId, seq: due.seq, attempt: due.attempt + 1, dueAt: Date.now() + this.opts.retryDelaysMs[due.attempt] });
        } else {
          rec.status = "failed";
        }
      }
    } finally {
      this.running = false;
      this.notifyIdle();
    }
  }

  private async post(eventId: string, manual: boolean): Promise<DeliveryAttempt> {
    const event = this.opts.getEvent(eventId);
    const url = this.opts.url;
    const secret = this.opts.secret;
    const started = Date.now();
    let rec = this.log.get(eventId);
    if (!rec && event) {
      rec = { eventId, type: event.type, status: "pending", attempts: [] };
      this.log.set(eventId, rec);
    }
    let attempt: DeliveryAttempt;
    if (!event || !url || !secret) {
      attempt = { at: started, status: null, ok: false, error: !event ? "event no longer exists" : "no webhook endpoint configured", durationMs: 0, manual, url: url ?? "" };
    } else {
      // Stripe sends the event pretty-printed; the signature covers these exact bytes.
      const body = JSON.stringify(event, null, 2);
      const header = signatureHeader(body, secret, Math.floor(Date.now() / 1000));
      try {
        const res = await fetch(url, {
          method: "POST",
          headers: { "content-type": "application/json; charset=utf-8", "stripe-signature": header, "user-agent": "LocalStripeFake/1.0 (+fakes/stripe)" },
          body,
          signal: AbortSignal.timeout(this.opts.timeoutMs),
        });
        await res.arrayBuffer().catch(() => undefined);
        attempt = { at: started, status: res.status, ok: res.status >= 200 && res.status < 300, durationMs: Date.now() - started, manual, url };
      } catch (err) {
        attempt = { at: started, status: null, ok: false, error: err instanceof Error ? `${err.name}: ${err.message}` : String(err), durationMs: Date.now() - started, manual, url };
      }
    }
    this.opts.onAttempt?.(eventId, attempt);
    if (rec) {
      rec.attempts.push(attempt);
      if (attempt.ok && rec.status !== "delivered") {
        rec.status = "delivered";
        this.opts.onDelivered(eventId);
      }
    }
    return attempt;
  }
}
