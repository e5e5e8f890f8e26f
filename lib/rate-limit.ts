/**
 * Fixed-window rate limits kept in the database, so every app process shares them.
 * One atomic upsert per hit: no read-then-write race.
 */
import { sql } from "drizzle-orm";
import { AppError } from "./errors";
import { write } from "@/db/write";

export interface Limit {
  /** Counter key, e.g. "signin:email:ann@example.com". */
  key: string;
  /** Maximum hits in one window. */
  max: number;
  /** Window length, ms. */
  windowMs: number;
}

/** Count one hit against each limit; returns the hit counts (after counting). */
export async function hit(limits: Limit[], now = Date.now()): Promise<number[]> {
  return write(async (db) => {
    const counts: number[] = [];
    for (const l of limits) {
      const start = now - (now % l.windowMs);
      const rows = await db.all<{ count: number }>(sql`
        INSERT INTO rate_limits (key, window_start, count) VALUES (${l.key}, ${start}, 1)
        ON CONFLICT(key) DO UPDATE SET
          count = CASE WHEN rate_limits.window_start < ${start} THEN 1 ELSE rate_limits.count + 1 END,
          window_start = CASE WHEN rate_limits.window_start < ${start} THEN ${start} ELSE rate_limits.window_start END
        RETURNING count`);
      counts.push(Number(rows[0]?.count ?? 1));
    }
    return counts;
  });
}

/** Current count of each limit's window without counting a hit. */
export async function peek(limits: Limit[], now = Date.now()): Promise<number[]> {
  return write(async (db) => {
    const out: number[] = [];
    for (const l of limits) {
      const start = now - (now % l.windowMs);
      const rows = await db.all<{ count: number; window_start: number }>(sql`SELECT count, window_start FROM rate_limits WHERE key = ${l.key}`);
      const r = rows[0];
      out.push(r && Number(r.window_start) >= start ? Number(r.count) : 0);
    }
    return out;
  });
}

/** Throws a 429 AppError if any limit is already exhausted. */
export async function assertNotLimited(limits: Limit[], message: string, now = Date.now()): Promise<void> {
  const counts = await peek(limits, now);
  const idx = counts.findIndex((c, i) => c >= limits[i].max);
  if (idx >= 0) {
    const l = limits[idx];
    const retry = Math.ceil((l.windowMs - (now % l.windowMs)) / 1000);
    throw new AppError("rate_limited", message, { headers: { "Retry-After": String(retry) } });
  }
}

/** Count a hit and throw a 429 when it goes over a limit. */
export async function consume(limits: Limit[], message: string, now = Date.now()): Promise<void> {
  const counts = await hit(limits, now);
  const idx = counts.findIndex((c, i) => c > limits[i].max);
  if (idx >= 0) {
    const l = limits[idx];
    const retry = Math.ceil((l.windowMs - (now % l.windowMs)) / 1000);
    throw new AppError("rate_limited", message, { headers: { "Retry-After": String(retry) } });
  }
}
