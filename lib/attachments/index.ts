/**
 * Attachments of a calculation: schematic images and PDFs, stored as bytes with their SHA-256.
 *
 * - Only staff see calculations (calc.view); another workspace's calculation or attachment is 404.
 * - The type is taken from the bytes (lib/attachments/detect.ts), never from the name or the
 *   browser; at most ATTACHMENT_MAX_BYTES each.
 * - While a calculation is issued its attachments are read-only: upload and delete answer 409.
 *   The status is read again inside the serialised write, so an issue that lands first wins.
 */
import { and, desc, eq } from "drizzle-orm";
import { attachments, calculations, users, type Calculation } from "@/db/schema";
import type { Db } from "@/db/client";
import { read, write } from "@/db/write";
import { AppError, notFound } from "@/lib/errors";
import { newId, sha256Hex } from "@/lib/ids";
import { auditInsert } from "@/lib/audit";
import type { WorkspaceContext } from "@/lib/auth/guard";
import { detectType, safeFilename } from "./detect";
import { ATTACHMENT_MAX_BYTES } from "./limits";

export { ATTACHMENT_MAX_BYTES } from "./limits";

/** An attachment as listed (no bytes). */
export interface AttachmentDto {
  id: string;
  calculationId: string;
  filename: string;
  mime: string;
  /** Bytes. */
  size: number;
  sha256: string;
  uploadedBy: { id: string; name: string };
  at: number;
}

/** The calculation of this workspace, or 404. */
async function getCalc(db: Db, ctx: WorkspaceContext, calcId: string): Promise<Pick<Calculation, "id" | "status" | "revision">> {
  const c = await db.query.calculations.findFirst({
    columns: { id: true, status: true, revision: true },
    where: and(eq(calculations.id, calcId), eq(calculations.workspaceId, ctx.workspace.id)),
  });
  if (!c) throw notFound("That calculation");
  return c;
}

function assertNotIssued(c: Pick<Calculation, "status" | "revision">): void {
  if (c.status === "issued") {
    throw new AppError("conflict", `Revision ${c.revision} of this calculation is issued, so its attachments are read-only. Start a new revision to add or remove attachments.`);
  }
}

const listColumns = {
  id: attachments.id,
  calculationId: attachments.calculationId,
  filename: attachments.filename,
  mime: attachments.mime,
  size: attachments.size,
  sha256: attachments.sha256,
  at: attachments.at,
  uploaderId: attachments.uploadedBy,
  uploaderName: users.name,
};

/** The attachments of a calculation, newest first. */
export async function listAttachments(ctx: WorkspaceContext, calcId: string): Promise<AttachmentDto[]> {
  const db = await read();
  await getCalc(db, ctx, calcId);
  const rows = await db
    .select(listColumns)
    .from(attachments)
    .innerJoin(users, eq(users.id, attachments.uploadedBy))
    .where(and(eq(attachments.calculationId, calcId), eq(attachments.workspaceId, ctx.workspace.id)))
    .orderBy(desc(attachments.at));
  return rows.map(({ uploaderId, uploaderName, ...rest }) => ({ ...rest, uploadedBy: { id: uploaderId, name: uploaderName } }));
}

/**
 * Store an uploaded file on a calculation after checking its size, its real type (from the
 * bytes, against the name's extension) and that the calculation is not issued.
 * @param file the name as uploaded and the bytes
 */
export async function addAttachment(ctx: WorkspaceContext, calcId: string, file: { name: string; bytes: Uint8Array }): Promise<AttachmentDto> {
  const db0 = await read();
  assertNotIssued(await getCalc(db0, ctx, calcId));
  if (file.bytes.byteLength > ATTACHMENT_MAX_BYTES) {
    throw new AppError("payload_too_large", `An attachment may be at most 10 MB (${ATTACHMENT_MAX_BYTES.toLocaleString("en")} bytes).`, { fields: { file: "must be at most 10 MB" } });
  }
  const type = await detectType(file.name, file.bytes);
  const filename = safeFilename(file.name, type.ext);
  const data = Buffer.from(file.bytes.buffer, file.bytes.byteOffset, file.bytes.byteLength);
  const sha256 = sha256Hex(data);
  const id = newId();
  const at = Date.now();
  await write(async (db) => {
    assertNotIssued(await getCalc(db, ctx, calcId));
    await db.batch([
      db.insert(attachments).values({ id, workspaceId: ctx.workspace.id, calculationId: calcId, filename, mime: type.mime, size: data.byteLength, sha256, data, uploadedBy: ctx.user.id, at }),
      auditInsert(db, {
        workspaceId: ctx.workspace.id,
        actorId: ctx.user.id,
        action: "attachment.uploaded",
        targetType: "calculation",
        targetId: calcId,
        data: { attachmentId: id, filename, mime: type.mime, size: data.byteLength, sha256 },
      }),
    ]);
  });
  return { id, calculationId: calcId, filename, mime: type.mime, size: data.byteLength, sha256, uploadedBy: { id: ctx.user.id, name: ctx.user.name }, at };
}

/** One attachment with its bytes, or 404 (also when it belongs to another calculation or workspace). */
export async function getAttachmentFile(ctx: WorkspaceContext, calcId: string, attachmentId: string) {
  const db = await read();
  await getCalc(db, ctx, calcId);
  const a = await db.query.attachments.findFirst({
    where: and(eq(attachments.id, attachmentId), eq(attachments.calculationId, calcId), eq(attachments.workspaceId, ctx.workspace.id)),
  });
  if (!a) throw notFound("That attachment");
  return a;
}

/** Delete an attachment (409 while the calculation is issued). */
export async function deleteAttachment(ctx: WorkspaceContext, calcId: string, attachmentId: string): Promise<{ deleted: string }> {
  const a = await getAttachmentFile(ctx, calcId, attachmentId);
  await write(async (db) => {
    assertNotIssued(await getCalc(db, ctx, calcId));
    await db.batch([
      db.delete(attachments).where(and(eq(attachments.id, attachmentId), eq(attachments.workspaceId, ctx.workspace.id))),
      auditInsert(db, {
        workspaceId: ctx.workspace.id,
        actorId: ctx.user.id,
        action: "attachment.deleted",
        targetType: "calculation",
        targetId: calcId,
        data: { attachmentId, filename: a.filename, sha256: a.sha256 },
      }),
    ]);
  });
  return { deleted: attachmentId };
}
