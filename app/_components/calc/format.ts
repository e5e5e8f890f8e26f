/**
 * Small formatting helpers of the calculation screens: status words, times, check summaries and
 * splitting a formatted quantity into its number and unit for aligned columns. Browser-safe.
 */
import { UNIT_SEPARATOR } from "@/lib/calc/core/units";
import type { CalcStatus } from "@/db/schema";

/** The status words the register, the sheet and the history use. */
export const STATUS_LABEL: Record<CalcStatus, string> = {
  draft: "Draft",
  in_check: "In check",
  approved: "Approved",
  issued: "Issued",
};

/** Words of history events. */
export const EVENT_LABEL: Record<string, string> = {
  create: "Created",
  save: "Saved",
  submit: "Submitted for check",
  return: "Returned to draft",
  approve: "Approved",
  reopen: "Reopened",
  revise: "New revision started",
  issue: "Issued",
};

const two = (n: number) => String(n).padStart(2, "0");

/** "14:03" in the browser's local time. */
export function timeOfDay(ms: number): string {
  const d = new Date(ms);
  return `${two(d.getHours())}:${two(d.getMinutes())}`;
}

/** "2025-12-02 14:03" in the browser's local time (the server renders UTC: see dateTimeUtc). */
export function dateTime(ms: number): string {
  const d = new Date(ms);
  return `${d.getFullYear()}-${two(d.getMonth() + 1)}-${two(d.getDate())} ${two(d.getHours())}:${two(d.getMinutes())}`;
}

/** "12 pass · 1 warning · 2 fail", leaving out zero counts; "—" without a summary. */
export function checkSummaryText(s: { pass: number; warning: number; fail: number } | null | undefined): string {
  if (!s) return "—";
  const parts: string[] = [];
  if (s.fail) parts.push(`${s.fail} fail`);
  if (s.warning) parts.push(`${s.warning} warning${s.warning === 1 ? "" : "s"}`);
  if (s.pass) parts.push(`${s.pass} pass`);
  return parts.length ? parts.join(" · ") : "no checks";
}

/**
 * Split "4.7 kΩ" into { num: "4.7", unit: "kΩ" } at the unit separator, so values and units can
 * sit in their own aligned columns. "45°" and plain numbers keep an empty unit (the degree sign
 * stays with its number).
 */
export function splitQuantity(text: string): { num: string; unit: string } {
  const i = text.lastIndexOf(UNIT_SEPARATOR);
  if (i <= 0) return { num: text, unit: "" };
  return { num: text.slice(0, i), unit: text.slice(i + 1) };
}

/** "1,000" style integer with thin grouping as the trade prints counts. */
export function count(n: number): string {
  return n.toLocaleString("en-GB");
}
