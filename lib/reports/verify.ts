/**
 * Public verification of issued reports, by code or by the PDF itself.
 *
 * - By code: the code printed on a report names one issued report; the answer says who prepared,
 *   checked and approved it, its revision, issue date, workspace and project, and whether a newer
 *   revision supersedes it. It cannot say whether a given file is unchanged: upload it for that.
 * - By file: the SHA-256 of the uploaded bytes is looked up among the stored hashes of issued
 *   reports. Equal hash = the very file that was issued, byte for byte. Any change (one byte)
 *   gives "does not match any issued report".
 *
 * Every attempt counts against a per-IP rate limit (lib/rate-limit.ts, shared by all processes).
 */
import { and, desc, eq, sql } from "drizzle-orm";
import { reports } from "@/db/schema";
import { read } from "@/db/write";
import { sha256Hex } from "@/lib/ids";
import { consume } from "@/lib/rate-limit";
import { normaliseVerificationCode } from "./code";

/** Largest file the verify page accepts, bytes (issued reports are far smaller). */
export const MAX_VERIFY_BYTES = 20 * 1024 * 1024;

/** Verification attempts per IP address and window. */
export const VERIFY_LIMIT = { max: 20, windowMs: 60_000 } as const;

/** What the verify page shows about an issued report. */
export interface VerifiedReport {
  code: string;
  workspace: string;
  project: string;
  calculationNumber: string;
  title: string;
  revision: string;
  /** ms since the epoch, and the printed "YYYY-MM-DD". */
  issuedAt: number;
  issueDate: string;
  preparedBy: string;
  checkedBy: string;
  approvedBy: string;
  engine: string;
  sha256: string;
  /** Size of the issued file, bytes. */
  size: number;
  /** Null while this is the current revision. */
  superseded: null | {
    /** When the newer revision was started, ms. */
    at: number;
    byRevision: string | null;
    /** The newest issued revision of the same calculation, if a newer one has been issued. */
    latestIssued: { revision: string; issuedAt: number; code: string } | null;
  };
}

export interface VerifyResult {
  method: "code" | "file";
  match: boolean;
  /** One sentence for the page. */
  message: string;
  report?: VerifiedReport;
  /** For a file: its SHA-256 (hex) as computed here. */
  sha256?: string;
  /** For a changed file: the code it claims in its signature, if one can be read. */
  claimedCode?: string;
}

/** The caller's IP for the rate limit: the first X-Forwarded-For hop, X-Real-IP, or "unknown". */
export function clientIp(headers: Headers): string {
  const fwd = headers.get("x-forwarded-for")?.split(",")[0]?.trim();
  const ip = fwd || headers.get("x-real-ip")?.trim() || "unknown";
  return ip.slice(0, 64);
}

/** Count one verification attempt; 429 with a clear message when the IP is over the limit. */
export async function limitVerify(ip: string): Promise<void> {
  await consume(
    [{ key: `verify:ip:${ip}`, max: VERIFY_LIMIT.max, windowMs: VERIFY_LIMIT.windowMs }],
    `Too many verification attempts from your network (more than ${VERIFY_LIMIT.max} a minute). Wait a minute, then try again.`,
  );
}

const columns = {
  id: reports.id,
  calculationId: reports.calculationId,
  code: reports.code,
  sha256: reports.sha256,
  revision: reports.revision,
  issuedAt: reports.issuedAt,
  preparedByName: reports.preparedByName,
  checkedByName: reports.checkedByName,
  approvedByName: reports.approvedByName,
  supersededAt: reports.supersededAt,
  supersededByRevision: reports.supersededByRevision,
  size: sql<number>`length(${reports.pdf})`,
  workspace: sql<string>`json_extract(${reports.snapshot}, '$.workspace.name')`,
  project: sql<string>`json_extract(${reports.snapshot}, '$.project.name')`,
  number: sql<string>`json_extract(${reports.snapshot}, '$.calculation.number')`,
  title: sql<string>`json_extract(${reports.snapshot}, '$.calculation.title')`,
  issueDate: sql<string>`json_extract(${reports.snapshot}, '$.issueDate')`,
  engineType: sql<string>`json_extract(${reports.snapshot}, '$.engine.typeId')`,
  engineVersion: sql<string>`json_extract(${reports.snapshot}, '$.engine.version')`,
};

async function findReport(where: ReturnType<typeof eq>): Promise<VerifiedReport | null> {
  const db = await read();
  const [r] = await db.select(columns).from(reports).where(where).limit(1);
  if (!r) return null;
  let superseded: VerifiedReport["superseded"] = null;
  if (r.supersededAt != null) {
    const [latest] = await db
      .select({ id: reports.id, revision: reports.revision, issuedAt: reports.issuedAt, code: reports.code })
      .from(reports)
      .where(and(eq(reports.calculationId, r.calculationId)))
      .orderBy(desc(reports.issuedAt))
      .limit(1);
    superseded = {
      at: Number(r.supersededAt),
      byRevision: r.supersededByRevision,
      latestIssued: latest && latest.id !== r.id ? { revision: latest.revision, issuedAt: Number(latest.issuedAt), code: latest.code } : null,
    };
  }
  return {
    code: r.code,
    workspace: String(r.workspace ?? ""),
    project: String(r.project ?? ""),
    calculationNumber: String(r.number ?? ""),
    title: String(r.title ?? ""),
    revision: r.revision,
    issuedAt: Number(r.issuedAt),
    issueDate: String(r.issueDate ?? new Date(Number(r.issuedAt)).toISOString().slice(0, 10)),
    preparedBy: r.preparedByName,
    checkedBy: r.checkedByName,
    approvedBy: r.approvedByName,
    engine: `${String(r.engineType ?? "")}@${String(r.engineVersion ?? "")}`,
    sha256: r.sha256,
    size: Number(r.size),
    superseded,
  };
}

function supersededSentence(r: VerifiedReport): string {
  if (!r.superseded) return "It is the current revision.";
  const newer = r.superseded.latestIssued;
  if (newer) return `It has been superseded: revision ${newer.revision} was issued on ${new Date(newer.issuedAt).toISOString().slice(0, 10)}.`;
  return `It has been superseded: revision ${r.superseded.byRevision ?? "(next)"} was started on ${new Date(r.superseded.at).toISOString().slice(0, 10)} and is not issued yet.`;
}

/** Look up a typed code (any case, with or without dashes). */
export async function verifyCode(typed: string): Promise<VerifyResult> {
  const code = normaliseVerificationCode(typed);
  if (!code) return { method: "code", match: false, message: "That is not a verification code. Codes look like LW-7K3Q-9XPA: “LW”, then two groups of four letters and digits." };
  const report = await findReport(eq(reports.code, code));
  if (!report) return { method: "code", match: false, message: `No issued report has the code ${code}. Check the code as printed on the report.` };
  return {
    method: "code",
    match: true,
    report,
    message: `${code} is the code of ${report.calculationNumber} revision ${report.revision}, issued by ${report.workspace} on ${report.issueDate}. ${supersededSentence(report)} To check that a file is exactly this report, upload it.`,
  };
}

/** The verification code a PDF names in its signature reason ("… (LW-XXXX-XXXX)"), if any. */
export function claimedCodeOf(bytes: Uint8Array): string | undefined {
  const text = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString("latin1");
  // The signature dictionary's literal string, e.g. "/Reason (Issued … rev. B \(LW-7K3Q-9XPA\))".
  const all = [...text.matchAll(/\/Reason\s*\([^\n]{0,300}?(LW-[0-9A-Z]{4}-[0-9A-Z]{4})/g)];
  const code = all.at(-1)?.[1];
  return code ? (normaliseVerificationCode(code) ?? undefined) : undefined;
}

/** Check an uploaded file byte for byte against the issued reports. */
export async function verifyFile(bytes: Uint8Array): Promise<VerifyResult> {
  const sha256 = sha256Hex(bytes);
  const report = await findReport(eq(reports.sha256, sha256));
  if (report) {
    return {
      method: "file",
      match: true,
      sha256,
      report,
      message: `This file is exactly the issued report ${report.calculationNumber} revision ${report.revision} (${report.code}), issued by ${report.workspace} on ${report.issueDate}. ${supersededSentence(report)}`,
    };
  }
  const claimed = claimedCodeOf(bytes);
  const known = claimed ? await findReport(eq(reports.code, claimed)) : null;
  return {
    method: "file",
    match: false,
    sha256,
    claimedCode: known ? claimed : undefined,
    message: known
      ? `This file does not match any issued report. It names the report ${known.code} (${known.calculationNumber} revision ${known.revision}), but its bytes differ from the file that was issued: it has been changed since. Ask ${known.workspace} for the issued file.`
      : "This file does not match any issued report. It may have been changed after issue, or it is not a Loopwright report.",
  };
}
