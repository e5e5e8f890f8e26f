import { createServer } from "node:http";
import type { AddressInfo } from "node:net";
import Stripe from "stripe";
import { describe, expect, it } from "vitest";
import { decodeForm, FormDecodeError, splitKey } from "./form";

/** Captures the exact request body the official SDK sends for `call`. */
async function sdkBody(call: (s: Stripe) => Promise<unknown>): Promise<{ method: string; path: string; body: string }> {
  let seen: { method: string; path: string; body: string } | null = null;
  const server = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => {
      seen = { method: req.method ?? "", path: req.url ?? "", body: Buffer.concat(chunks).toString("utf8") };
      res.writeHead(200, { "content-type": "application/json" });
      res.end(JSON.stringify({ id: "x", object: "customer" }));
    });
  });
  await new Promise<void>((r) => server.listen(0, "127.0.0.1", r));
  const port = (server.address() as AddressInfo).port;
  try {
    await call(new Stripe("sk_test_capture", { host: "127.0.0.1", port, protocol: "http", maxNetworkRetries: 0 }));
  } finally {
    await new Promise<void>((r) => server.close(() => r()));
  }
  if (!seen) throw new Error("the SDK sent nothing");
  return seen;
}

describe("form decoding", () => {
  it("splits bracketed keys into segments", () => {
    expect(splitKey("line_items[0][price]")).toEqual(["line_items", "0", "price"]);
    expect(splitKey("expand[]")).toEqual(["expand", ""]);
    expect(splitKey("plain")).toEqual(["plain"]);
  });

  it("decodes the body the official SDK encodes for a checkout session (outside check: the SDK's own encoder)", async () => {
    const params = {
      mode: "subscription" as const,
      line_items: [
        { price: "price_a", quantity: 3 },
        { price: "price_b", quantity: 1 },
      ],
      customer_email: "ops+billing@example.test",
      metadata: { workspace_id: "ws_1", "note with space": "a&b=c" },
      subscription_data: { metadata: { workspace_id: "ws_1" }, trial_period_days: 14 },
      success_url: "http://127.0.0.1:3000/billing?session={CHECKOUT_SESSION_ID}",
      expand: ["subscription", "customer"],
    };
    const sent = await sdkBody((s) => s.checkout.sessions.create(params));
    expect(sent.method).toBe("POST");
    expect(sent.path).toBe("/v1/checkout/sessions");
    expect(decodeForm(sent.body)).toEqual({
      mode: "subscription",
      line_items: [
        { price: "price_a", quantity: "3" },
        { price: "price_b", quantity: "1" },
      ],
      customer_email: "ops+billing@example.test",
      metadata: { workspace_id: "ws_1", "note with space": "a&b=c" },
      subscription_data: { metadata: { workspace_id: "ws_1" }, trial_period_days: "14" },
      success_url: "http://127.0.0.1:3000/billing?session={CHECKOUT_SESSION_ID}",
      expand: ["subscription", "customer"],
    });
  });

  it("decodes the SDK's query string for a list with lookup_keys[] (GET params travel in the URL)", async () => {
    const sent = await sdkBody((s) => s.prices.list({ lookup_keys: ["amp_monthly", "filter_monthly"], active: true, limit: 3 }));
    expect(sent.method).toBe("GET");
    const query = sent.path.split("?")[1] ?? "";
    expect(decodeForm(query)).toEqual({ lookup_keys: ["amp_monthly", "filter_monthly"], active: "true", limit: "3" });
  });

  it("decodes subscription item updates with deleted flags and an unset metadata", async () => {
    const sent = await sdkBody((s) =>
      s.subscriptions.update("sub_1", { items: [{ id: "si_1", quantity: 5 }, { id: "si_2", deleted: true }], metadata: "", proration_behavior: "none" }),
    );
    expect(decodeForm(sent.body)).toEqual({ items: [{ id: "si_1", quantity: "5" }, { id: "si_2", deleted: "true" }], metadata: "", proration_behavior: "none" });
  });

  it("accepts `[]` appends and percent-encoded brackets as well", () => {
    expect(decodeForm("expand[]=a&expand[]=b")).toEqual({ expand: ["a", "b"] });
    expect(decodeForm("expand%5B%5D=a&metadata%5Bk%5D=v+w")).toEqual({ expand: ["a"], metadata: { k: "v w" } });
    // Index order, not arrival order, decides the array order.
    expect(decodeForm("items[1][id]=b&items[0][id]=a")).toEqual({ items: [{ id: "a" }, { id: "b" }] });
  });

  it("refuses a key used both as a value and as a hash", () => {
    expect(() => decodeForm("metadata[k]=v&metadata[k][x]=y")).toThrow(FormDecodeError);
    expect(() => decodeForm("a=1&a[b]=2")).toThrow(FormDecodeError);
  });
});
