/**
 * CSV import into the parts library, in two steps:
 *
 * 1. preview: parse and validate every row against the library; nothing is written. The answer
 *    carries `previewHash`, the SHA-256 of exactly the rows a confirm would import.
 * 2. confirm: the client sends the same file again with that hash. The server parses and
 *    validates it again; if the valid rows are not exactly those previewed (the file or the
 *    library changed in between) it answers 409 and imports nothing. Otherwise every valid row
 *    is inserted in one atomic db.batch (all or nothing), with one audit event.
 *
 * So a confirm can never import something other than what the user saw, and the server keeps
 * no state between the two steps.
 */
import { parts } from "@/db/schema";
import { write, read } from "@/db/write";
import { AppError } from "@/lib/errors";
import { newId } from "@/lib/ids";
import { auditInsert } from "@/lib/audit";
import type { WorkspaceContext } from "@/lib/auth/guard";
import { libraryNames } from "./index";
import { nameKey, type PartKind } from "./fields";
import { importHash, validateCsv, type ImportPreview, type ValidPart } from "./csv";

/** Rows per INSERT statement (9 columns each stays far below SQLite's variable limit). */
const INSERT_CHUNK = 400;

/** Validate an uploaded CSV against the library without writing anything. */
export async function previewImport(ctx: WorkspaceContext, kind: PartKind, text: string): Promise<ImportPreview> {
  const names = await libraryNames(await read(), ctx.workspace.id, kind);
  return validateCsv(kind, text, names).preview;
}

/** Outcome of a confirmed import. */
export interface ImportResult {
  kind: PartKind;
  imported: number;
  /** Rows of the file that were not imported (they were shown as wrong in the preview). */
  skipped: number;
}

function changed(reason: string): AppError {
  return new AppError("conflict", `Nothing was imported: ${reason} since the preview. Preview the file again and confirm what it shows.`);
}

/**
 * Import the valid rows of `text`, provided they are exactly those of the preview `previewHash`.
 * One atomic batch: either every valid row is in the library afterwards, or none is.
 */
export async function confirmImport(ctx: WorkspaceContext, kind: PartKind, text: string, previewHash: string): Promise<ImportResult> {
  const names = await libraryNames(await read(), ctx.workspace.id, kind);
  const { preview, validParts } = validateCsv(kind, text, names);
  if (preview.previewHash !== previewHash) throw changed("the file or the parts library has changed");
  if (validParts.length === 0) throw new AppError("invalid_input", "No row of the file is valid, so there is nothing to import. Correct the rows shown in the preview.", { fields: { file: "has no valid rows" } });
  const now = Date.now();
  await write(async (db) => {
    // The library may have changed between the read above and this write: check again inside
    // the serialised write (the unique index backs this up across processes).
    const current = await libraryNames(db, ctx.workspace.id, kind);
    const clash = validParts.find((p) => current.has(nameKey(p.name)));
    if (clash) throw changed(`a part named "${clash.name}" was added to the library`);
    if (importHash(kind, validParts) !== previewHash) throw changed("the file has changed");
    const rows = validParts.map((p: ValidPart) => ({
      id: newId(),
      workspaceId: ctx.workspace.id,
      kind,
      name: p.name,
      params: p.params,
      notes: p.notes,
      createdBy: ctx.user.id,
      createdAt: now,
      updatedAt: now,
    }));
    const inserts = [];
    for (let i = 0; i < rows.length; i += INSERT_CHUNK) inserts.push(db.insert(parts).values(rows.slice(i, i + INSERT_CHUNK)));
    const audit = auditInsert(db, {
      workspaceId: ctx.workspace.id,
      actorId: ctx.user.id,
      action: "parts.imported",
      targetType: "workspace",
      targetId: ctx.workspace.id,
      data: { kind, imported: rows.length, skipped: preview.invalid, previewHash },
    });
    try {
      await db.batch([audit, ...inserts]);
    } catch (err) {
      const msg = err instanceof Error ? `${err.message} ${String((err as { cause?: unknown }).cause ?? "")}` : String(err);
      if (/UNIQUE constraint failed: parts\./.test(msg)) throw changed("a part with one of these names was added to the library");
      throw err;
    }
  });
  return { kind, imported: validParts.length, skipped: preview.invalid };
}
