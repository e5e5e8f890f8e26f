/**
 * Conditional inserts for atomic batches. A batch cannot branch, so a row that must only be
 * written if an earlier conditional UPDATE of the same batch applied (e.g. a history row for a
 * save guarded by `WHERE version = ?`) is inserted with `INSERT … SELECT … WHERE EXISTS (guard)`.
 * The whole batch is one transaction, so either all the dependent rows land or none do.
 */
import { getTableColumns, sql, type SQL } from "drizzle-orm";
import type { SQLiteTable } from "drizzle-orm/sqlite-core";
import type { Db } from "./client";

/** `INSERT INTO table (…) SELECT … WHERE EXISTS (guard)` — batchable. */
export function insertWhere<T extends SQLiteTable>(db: Db, table: T, values: T["$inferInsert"], guard: SQL) {
  const cols = getTableColumns(table) as Record<string, { name: string; mapToDriverValue(v: unknown): unknown }>;
  const names: Array<SQL | ReturnType<typeof sql.identifier>> = [];
  const vals: SQL[] = [];
  for (const [k, v] of Object.entries(values as Record<string, unknown>)) {
    if (v === undefined) continue;
    const col = cols[k];
    if (!col) throw new Error(`insertWhere: unknown column ${k}`);
    names.push(sql.identifier(col.name));
    vals.push(v === null ? sql`NULL` : sql`${col.mapToDriverValue(v)}`);
  }
  return db.run(sql`INSERT INTO ${table} (${sql.join(names, sql`, `)}) SELECT ${sql.join(vals, sql`, `)} WHERE EXISTS (${guard})`);
}
