/**
 * Helpers that build Check objects with a normalised margin (see Check.margin in types.ts:
 * > 0 passes, < 0 fails, ranked by part screening), and guards that turn a non-finite or
 * impossible intermediate value into a failing check with an explanation.
 */
import type { Check, Severity } from "./types";

const MARGIN_LIMIT = 1e6;

function clampMargin(m: number): number {
  if (Number.isNaN(m)) return -1;
  return Math.max(-MARGIN_LIMIT, Math.min(MARGIN_LIMIT, m));
}

/**
 * Normalised margin of `actual` against `limit`.
 * - "atMost": (limit − actual) / |limit|
 * - "atLeast": (actual − limit) / |limit|
 * When the limit is 0 the scale is |actual| (or 1), so the margin stays finite.
 * @returns a finite number, clamped to ±1e6
 */
export function margin(actual: number, limit: number, sense: "atMost" | "atLeast"): number {
  if (!Number.isFinite(actual) || !Number.isFinite(limit)) return -1;
  const scale = Math.abs(limit) > 0 ? Math.abs(limit) : Math.abs(actual) > 0 ? Math.abs(actual) : 1;
  const m = sense === "atMost" ? (limit - actual) / scale : (actual - limit) / scale;
  return clampMargin(m);
}

/** Sentences for each outcome of a limit check. */
export interface LimitMessages {
  /** A sentence, or a function building it (only the outcome's sentence is built). */
  pass: string | (() => string);
  fail: string | (() => string);
  /** Used when the check passes with less than `warnBelow` margin (defaults to `pass`). */
  warn?: string | (() => string);
}

function text(m: string | (() => string)): string {
  return typeof m === "function" ? m() : m;
}

/** Options of a limit check. */
export interface LimitOptions {
  /** Margin below which a passing check is a warning, e.g. 0.1 for 10 % (default: never). */
  warnBelow?: number;
}

function limitCheck(
  id: string,
  title: string,
  actual: number,
  limit: number,
  sense: "atMost" | "atLeast",
  messages: LimitMessages,
  opts: LimitOptions,
): Check {
  const m = margin(actual, limit, sense);
  const ok = Number.isFinite(actual) && Number.isFinite(limit) && (sense === "atMost" ? actual <= limit : actual >= limit);
  let severity: Severity = ok ? "pass" : "fail";
  let pick = ok ? messages.pass : messages.fail;
  if (ok && opts.warnBelow !== undefined && m < opts.warnBelow) {
    severity = "warning";
    pick = messages.warn ?? messages.pass;
  }
  const message = text(pick);
  return { id, severity, title, message, margin: m };
}

/**
 * A check that passes when actual ≤ limit.
 * @param id stable id, e.g. "dc.error"
 * @param title short title
 * @param actual the computed value (same unit as limit)
 * @param limit the largest allowed value
 * @param messages sentences for pass / fail / warning, with the numbers
 */
export function checkAtMost(id: string, title: string, actual: number, limit: number, messages: LimitMessages, opts: LimitOptions = {}): Check {
  return limitCheck(id, title, actual, limit, "atMost", messages, opts);
}

/**
 * A check that passes when actual ≥ limit.
 * @param id stable id, e.g. "bandwidth"
 * @param title short title
 * @param actual the computed value (same unit as limit)
 * @param limit the smallest allowed value
 * @param messages sentences for pass / fail / warning, with the numbers
 */
export function checkAtLeast(id: string, title: string, actual: number, limit: number, messages: LimitMessages, opts: LimitOptions = {}): Check {
  return limitCheck(id, title, actual, limit, "atLeast", messages, opts);
}

/** A check with a fixed outcome. */
export function makeCheck(id: string, severity: Severity, title: string, message: string, checkMargin?: number): Check {
  return { id, severity, title, message, ...(checkMargin !== undefined ? { margin: clampMargin(checkMargin) } : {}) };
}

/**
 * Guard an intermediate value: null when it is finite (and, if given, satisfies `valid`),
 * otherwise a failing check that says what could not be computed and why.
 * @param id check id
 * @param title what the value is, e.g. "Largest bias resistor"
 * @param value the intermediate value
 * @param explanation what makes it impossible and what to change, one sentence
 * @param valid optional extra condition, e.g. (v) => v > 0
 */
export function guardValue(id: string, title: string, value: number, explanation: string, valid?: (v: number) => boolean): Check | null {
  if (Number.isFinite(value) && (!valid || valid(value))) return null;
  return { id, severity: "fail", title, message: explanation, margin: -1 };
}

/** The smallest margin among checks that have one (undefined when none has). */
export function worstMargin(checks: readonly Check[]): number | undefined {
  let worst: number | undefined;
  for (const c of checks) if (c.margin !== undefined && (worst === undefined || c.margin < worst)) worst = c.margin;
  return worst;
}

/** The most severe outcome of a set of checks ("pass" when empty). */
export function worstSeverity(checks: readonly Check[]): Severity {
  if (checks.some((c) => c.severity === "fail")) return "fail";
  if (checks.some((c) => c.severity === "warning")) return "warning";
  return "pass";
}
