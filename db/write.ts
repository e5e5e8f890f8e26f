/**
 * Writes, serialised inside the process.
 *
 * libSQL's embedded client is synchronous underneath and hands its connection away during an
 * interactive transaction (see shared FIELD-NOTES): concurrent writers then fail with
 * SQLITE_BUSY or stall the event loop. So every write in a request path goes through `write()`:
 * one at a time per process, each a short read-then-write or an atomic `db.batch([...])`, never
 * an interactive transaction, never awaiting other work (mail, rendering, network) inside.
 * Across processes (libSQL server) correctness comes from conditional updates
 * (`WHERE version = ?`) and unique keys, not from this queue.
 */
import { dbReady, type Db } from "./client";

let tail: Promise<unknown> = Promise.resolve();

/** Run `fn` with the database once all earlier writes in this process have finished. */
export function write<T>(fn: (db: Db) => Promise<T>): Promise<T> {
  const run = tail.then(async () => fn(await dbReady()));
  // Keep the chain alive whether or not this write fails.
  tail = run.then(
    () => undefined,
    () => undefined,
  );
  return run;
}

/** The database for reads (no queueing needed: WAL readers never block). */
export function read(): Promise<Db> {
  return dbReady();
}
