/** The billing forms' input rules, shared by the route handlers and the billing page (client-safe). */
import { z } from "zod";
import { MAX_SEATS, PACK_IDS } from "./plans";

/** A number of paid seats: a whole number from 1 to MAX_SEATS. */
export const seatsSchema = z
  .number({ error: "must be a whole number of seats" })
  .int("must be a whole number of seats")
  .min(1, "must be at least 1 seat")
  .max(MAX_SEATS, `must be at most ${MAX_SEATS} seats (write to us for more)`);

/** Body of POST /api/w/:slug/billing/seats. */
export const changeSeatsSchema = z.object({ seats: seatsSchema });

/** Body of POST /api/w/:slug/billing/checkout: the packs (all three = the bundle) and the seats. */
export const checkoutSchema = z.object({
  packs: z
    .array(z.enum(PACK_IDS, { error: (iss) => `"${String(iss.input)}" is not a pack; use amplifier, filter or reference` }), { error: "must be a list of packs" })
    .min(1, "choose at least one pack")
    .refine((a) => new Set(a).size === a.length, "lists a pack more than once"),
  seats: seatsSchema,
});

export type CheckoutInput = z.output<typeof checkoutSchema>;
