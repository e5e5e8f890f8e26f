/**
 * The starter set: the invented generic example parts (lib/calc/core/demo-parts.ts) that a new
 * workspace can add to an empty library to try the tool. They are marked as examples in their
 * notes; a firm replaces them with the parts it has approved.
 */
import { DEMO_OPAMPS, DEMO_REFERENCES } from "@/lib/calc/core/demo-parts";
import { parts } from "@/db/schema";
import { write } from "@/db/write";
import { newId } from "@/lib/ids";
import { auditInsert } from "@/lib/audit";
import type { WorkspaceContext } from "@/lib/auth/guard";
import { libraryNames, type PartKind } from "./index";
import { nameKey } from "./fields";

export const STARTER_NOTE = "Generic example part with invented values (starter set). Replace it with a part your firm has approved, using the maker's data.";

/** Add the starter parts of `kind` whose names are not in the library yet. Returns how many. */
export async function addStarterParts(ctx: WorkspaceContext, kind: PartKind): Promise<{ added: number; skipped: number }> {
  const source = (kind === "opamp" ? DEMO_OPAMPS : DEMO_REFERENCES) as ReadonlyArray<{ name: string } & Record<string, number | string>>;
  const now = Date.now();
  return write(async (db) => {
    const taken = await libraryNames(db, ctx.workspace.id, kind);
    const fresh = source.filter((p) => !taken.has(nameKey(p.name)));
    if (fresh.length === 0) return { added: 0, skipped: source.length };
    await db.batch([
      db.insert(parts).values(
        fresh.map(({ name, ...params }) => ({ id: newId(), workspaceId: ctx.workspace.id, kind, name, params, notes: STARTER_NOTE, createdBy: ctx.user.id, createdAt: now, updatedAt: now })),
      ),
      auditInsert(db, { workspaceId: ctx.workspace.id, actorId: ctx.user.id, action: "part.starter_added", targetType: "workspace", targetId: ctx.workspace.id, data: { kind, count: fresh.length } }),
    ]);
    return { added: fresh.length, skipped: source.length - fresh.length };
  });
}
