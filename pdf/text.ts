/**
 * Small wording helpers for the report layout (labels, not quantities: quantities arrive
 * formatted in the ReportModel).
 */
import { formatQuantity } from "../lib/calc/core/units";
import type { ReportModel } from "../lib/reports/model";

const STATUS_LABELS: Record<ReportModel["calculation"]["status"], string> = {
  draft: "Draft",
  in_check: "In check",
  approved: "Approved",
  issued: "Issued",
};

/** "Issued", "In check" … */
export function statusLabel(status: ReportModel["calculation"]["status"]): string {
  return STATUS_LABELS[status];
}

/** A check margin (fraction, > 0 passes) as a signed percentage: "+23 %", "−4.5 %", "—". */
export function formatMargin(margin: number | undefined): string {
  if (margin === undefined || !Number.isFinite(margin)) return "—";
  if (margin === 0) return "0 %";
  const body = formatQuantity(Math.abs(margin), "%", { scale: "percent", digits: 2 });
  return `${margin < 0 ? "−" : "+"}${body}`;
}

/** A component tolerance (fraction) as "±1 %", "±0.1 %"; "—" when none. */
export function formatTolerance(tolerance: number | undefined): string {
  if (tolerance === undefined || !Number.isFinite(tolerance) || tolerance <= 0) return "—";
  return `±${formatQuantity(tolerance, "%", { scale: "percent", digits: 3 })}`;
}

/**
 * True when a cell holds a number (optionally signed, with a unit or a range), so it may use
 * tabular digits; names such as "LW-OA320" or "Sallen-Key" keep proportional spacing.
 */
export function looksNumeric(text: string): boolean {
  return /^[±+−-]?\(?[\d.,]+/.test(text.trim());
}

/** "https://app.example/verify?code=…" → "app.example/verify" (for the footer). */
export function urlWithoutScheme(url: string): string {
  try {
    const u = new URL(url);
    return `${u.host}${u.pathname === "/" ? "" : u.pathname}`;
  } catch {
    return url;
  }
}
