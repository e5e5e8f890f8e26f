/**
 * The database client: one libSQL client per process, created on first use (opening the file at
 * import time breaks `next build`). DATABASE_URL is either an embedded file (`file:./data/x.db`,
 * the default) or a libSQL server URL (`http://…`, `libsql://…`) for scale-out: same code.
 */
import { createClient, type Client } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import fs from "node:fs";
import path from "node:path";
import * as schema from "./schema";

export type Db = LibSQLDatabase<typeof schema>;

const DEFAULT_URL = "file:./data/loopwright.db";

interface Holder {
  client?: Client;
  db?: Db;
  url?: string;
  ready?: Promise<void>;
}
// Survive Next's module reloading in dev: keep the one client on globalThis.
const holder: Holder = ((globalThis as { __loopwrightDb?: Holder }).__loopwrightDb ??= {});

export function databaseUrl(): string {
  return process.env.DATABASE_URL || DEFAULT_URL;
}

function isFileUrl(url: string): boolean {
  return url.startsWith("file:");
}

/** The raw libSQL client (created on first call). */
export function getClient(): Client {
  if (holder.client) return holder.client;
  const url = databaseUrl();
  if (isFileUrl(url)) {
    const file = url.slice("file:".length).split("?")[0];
    if (file && file !== ":memory:") fs.mkdirSync(path.dirname(path.resolve(file)), { recursive: true });
  }
  const client = createClient({ url, authToken: process.env.DATABASE_AUTH_TOKEN || undefined });
  holder.client = client;
  holder.url = url;
  holder.ready = (async () => {
    if (isFileUrl(url)) {
      await client.execute("PRAGMA journal_mode = WAL");
      await client.execute("PRAGMA busy_timeout = 5000");
      await client.execute("PRAGMA synchronous = NORMAL");
    }
    await client.execute("PRAGMA foreign_keys = ON");
  })();
  return client;
}

/** The Drizzle database over the one client. Await `dbReady()` once before the first query. */
export function getDb(): Db {
  if (holder.db) return holder.db;
  holder.db = drizzle(getClient(), { schema });
  return holder.db;
}

/** Resolves once the connection pragmas are set. */
export async function dbReady(): Promise<Db> {
  const db = getDb();
  await holder.ready;
  return db;
}

/** Close the client (tests and scripts). */
export async function closeDb(): Promise<void> {
  holder.client?.close();
  holder.client = undefined;
  holder.db = undefined;
  holder.ready = undefined;
}
