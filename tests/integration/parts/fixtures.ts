/** Parts inserted directly into the database for tests (the demo parameter sets, SI units). */
import { eq } from "drizzle-orm";
import { write, read } from "@/db/write";
import { parts } from "@/db/schema";
import { DEMO_OPAMPS, DEMO_REFERENCES } from "@/lib/calc/core/demo-parts";

/** Insert a demo op-amp (or reference) under `id` in `workspaceId`, unless `id` exists. */
export async function insertPart(id: string, workspaceId: string, opts: { kind?: "opamp" | "reference"; name?: string } = {}): Promise<void> {
  const db = await read();
  if (await db.query.parts.findFirst({ where: eq(parts.id, id) })) return;
  const kind = opts.kind ?? "opamp";
  const { name, ...params } = (kind === "opamp" ? DEMO_OPAMPS[0] : DEMO_REFERENCES[0]) as { name: string } & Record<string, number | string>;
  await write((w) => w.insert(parts).values({ id, workspaceId, kind, name: opts.name ?? `${name} (${id.slice(0, 12)})`, params, notes: "", createdAt: Date.now(), updatedAt: Date.now() }).onConflictDoNothing());
}
