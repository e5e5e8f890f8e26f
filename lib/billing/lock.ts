/**
 * One billing sync at a time in this process. A sync fetches the subscription from Stripe and
 * then writes it; two syncs interleaving could commit an older fetch after a newer one. This
 * queue keeps fetch-then-write pairs in order. It is separate from the database write queue
 * (db/write.ts): the network call happens here, never inside `write()`. Across processes the
 * conditional updates in lib/billing/subscription.ts keep the result safe.
 */
let tail: Promise<unknown> = Promise.resolve();

/** Run `fn` once every earlier billing sync in this process has finished. */
export function billingSync<T>(fn: () => Promise<T>): Promise<T> {
  const run = tail.then(fn);
  tail = run.then(
    () => undefined,
    () => undefined,
  );
  return run;
}
