/** Shapes the calculation screens pass between the server pages and the client components. */
import type { FieldSpec, PackId, RawInputs } from "@/lib/calc/core/types";
import type { CalculationView } from "@/lib/calculations";

/** A calculation as the API returns it (GET/PATCH /calculations/:id, transitions). */
export type SheetCalculation = CalculationView;

/** What the sheet needs of a calculation type: data only, no compute (that runs on the server). */
export interface SheetType {
  id: string;
  title: string;
  summary: string;
  pack: PackId;
  version: string;
  fields: FieldSpec[];
  defaults: RawInputs;
}

/** What the signed-in member may do on the sheet (from the permission matrix, on the server). */
export interface SheetPermissions {
  edit: boolean;
  submit: boolean;
  review: boolean;
  issue: boolean;
  /** The workspace accepts changes (not read-only for billing reasons). */
  writable: boolean;
  /** Why the workspace is read-only, when it is. */
  readOnlyMessage?: string;
  /** The type's pack may run (subscribed and not read-only). */
  packUnlocked: boolean;
  packLockedMessage?: string;
  /** Owners can unlock packs on the billing page. */
  canManageBilling: boolean;
}

/** A part of the workspace library (GET /api/w/:slug/parts). */
export interface LibraryPart {
  id: string;
  kind: "opamp" | "reference";
  name: string;
  values: Record<string, number | string>;
  notes: string;
}
