/**
 * Small wording helpers for the report layout (labels, not quantities: quantities arrive
 * formatted in the ReportModel).
 */
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

function percent(fraction: number): string {
  const p = fraction * 100;
  const a = Math.abs(p);
  const digits = a >= 10 ? 0 : a >= 1 ? 1 : 2;
  return a.toFixed(digits).replace(/(\.\d*?)0+$/, "$1").replace(/\.$/, "");
}

/** A check margin (fraction, > 0 passes) as a signed percentage: "+23 %", "−4.5 %", "—". */
export function formatMargin(margin: number | undefined): string {
  if (margin === undefined || !Number.isFinite(margin)) return "—";
  const body = percent(margin);
  if (body === "0") return "0 %";
  return `${margin < 0 ? "−" : "+"}${body} %`;
}

/** A component tolerance (fraction) as "±1 %", "±0.1 %"; "—" when none. */
export function formatTolerance(tolerance: number | undefined): string {
  if (tolerance === undefined || !Number.isFinite(tolerance) || tolerance <= 0) return "—";
  return `±${percent(tolerance)} %`;
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
