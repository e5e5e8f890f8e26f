/**
 * Typed access to decoded form params with Stripe-style validation errors. Each getter
 * names the full bracketed param (`items[0][quantity]`) in its error, as Stripe does.
 */
import { invalidParam, missingParam, StripeApiError } from "./errors";
import type { FormParams, FormValue } from "./form";

/** Pagination params every list endpoint accepts. */
export const PAGINATION = ["limit", "starting_after", "ending_before", "expand"] as const;

/** A view on a params record at a path (e.g. `line_items[0]`). */
export class Params {
  constructor(
    readonly raw: FormParams,
    readonly prefix = "",
  ) {}

  /** The full param name of `key` at this path, e.g. `line_items[0][price]`. */
  name(key: string): string {
    return this.prefix ? `${this.prefix}[${key}]` : key;
  }

  has(key: string): boolean {
    return this.raw[key] !== undefined;
  }

  /**
   * Rejects keys Stripe does not define for this endpoint (400 `parameter_unknown`, as Stripe
   * answers). `known` lists every param Stripe accepts here, handled by the fake or not.
   */
  allowOnly(known: readonly string[]): void {
    for (const key of Object.keys(this.raw)) {
      if (!known.includes(key)) {
        throw new StripeApiError(400, "invalid_request_error", `Received unknown parameter: ${this.name(key)}`, this.name(key), "parameter_unknown");
      }
    }
  }

  /** An optional string; "" counts as given (callers decide what empty means). */
  str(key: string): string | undefined {
    const v = this.raw[key];
    if (v === undefined) return undefined;
    if (typeof v !== "string") throw invalidParam(this.name(key), `Invalid string: ${this.name(key)} must be a string, not a hash or array.`, "parameter_invalid_string");
    return v;
  }

  /** A required non-empty string. */
  reqStr(key: string): string {
    const v = this.str(key);
    if (v === undefined) throw missingParam(this.name(key));
    if (v === "") throw invalidParam(this.name(key), `You passed an empty string for '${this.name(key)}'. We assume empty values are an attempt to unset a parameter; however '${this.name(key)}' cannot be unset. You should remove '${this.name(key)}' from your request or supply a non-empty value.`, "parameter_invalid_empty");
    return v;
  }

  /** An optional non-empty string ("" is refused). */
  optStr(key: string): string | undefined {
    return this.has(key) ? this.reqStr(key) : undefined;
  }

  /** A string that may be unset with "" (→ null). */
  nullableStr(key: string): string | null | undefined {
    const v = this.str(key);
    if (v === undefined) return undefined;
    return v === "" ? null : v;
  }

  /** An optional integer within [min, max]. */
  int(key: string, min = Number.MIN_SAFE_INTEGER, max = Number.MAX_SAFE_INTEGER): number | undefined {
    const v = this.str(key);
    if (v === undefined) return undefined;
    if (!/^-?\d+$/.test(v)) throw invalidParam(this.name(key), `Invalid integer: ${v}`, "parameter_invalid_integer");
    const n = Number(v);
    if (n < min) throw invalidParam(this.name(key), `This value must be greater than or equal to ${min}.`, "parameter_invalid_integer");
    if (n > max) throw invalidParam(this.name(key), `This value must be less than or equal to ${max}.`, "parameter_invalid_integer");
    return n;
  }

  /** A required integer within [min, max]. */
  reqInt(key: string, min?: number, max?: number): number {
    const n = this.int(key, min, max);
    if (n === undefined) throw missingParam(this.name(key));
    return n;
  }

  /** An optional boolean (`true` / `false`). */
  bool(key: string): boolean | undefined {
    const v = this.str(key);
    if (v === undefined) return undefined;
    if (v === "true") return true;
    if (v === "false") return false;
    throw invalidParam(this.name(key), `Invalid boolean: ${v}`, "parameter_invalid_boolean");
  }

  /** An optional value from a fixed set. */
  oneOf<T extends string>(key: string, values: readonly T[]): T | undefined {
    const v = this.str(key);
    if (v === undefined) return undefined;
    if (!(values as readonly string[]).includes(v)) {
      throw invalidParam(this.name(key), `Invalid ${this.name(key)}: must be one of ${values.join(", ")}`, "parameter_invalid");
    }
    return v as T;
  }

  /** A nested hash, or undefined. */
  obj(key: string): Params | undefined {
    const v = this.raw[key];
    if (v === undefined) return undefined;
    if (typeof v === "string" || Array.isArray(v)) {
      if (v === "") return undefined;
      throw invalidParam(this.name(key), `Invalid hash: ${this.name(key)} must be a hash.`, "parameter_invalid");
    }
    return new Params(v, this.name(key));
  }

  /** An array of hashes (each a Params view), or undefined. */
  objArray(key: string): Params[] | undefined {
    const v = this.raw[key];
    if (v === undefined) return undefined;
    if (!Array.isArray(v)) throw invalidParam(this.name(key), `Invalid array: ${this.name(key)} must be an array.`, "parameter_invalid");
    return v.map((el, i) => {
      const name = `${this.name(key)}[${i}]`;
      if (typeof el === "string" || Array.isArray(el)) throw invalidParam(name, `Invalid hash: ${name} must be a hash.`, "parameter_invalid");
      return new Params(el, name);
    });
  }

  /** An array of strings (`expand[]=a&expand[]=b`), or undefined. A single string counts as one. */
  strArray(key: string): string[] | undefined {
    const v = this.raw[key];
    if (v === undefined) return undefined;
    if (typeof v === "string") return v === "" ? [] : [v];
    if (!Array.isArray(v)) throw invalidParam(this.name(key), `Invalid array: ${this.name(key)} must be an array of strings.`, "parameter_invalid");
    return v.map((el, i) => {
      if (typeof el !== "string") throw invalidParam(`${this.name(key)}[${i}]`, `Invalid string: ${this.name(key)}[${i}]`, "parameter_invalid_string");
      return el;
    });
  }

  /**
   * A metadata update: `undefined` (not given), `null` (cleared with `metadata=""`), or a
   * record where "" values mean "remove this key". At most 50 keys, keys ≤ 40 chars, values
   * ≤ 500 chars (Stripe's limits).
   */
  metadata(key = "metadata"): Record<string, string> | null | undefined {
    const v: FormValue | undefined = this.raw[key];
    if (v === undefined) return undefined;
    if (v === "") return null;
    if (typeof v === "string") throw invalidParam(this.name(key), `Invalid hash: ${this.name(key)} must be a hash of strings.`, "parameter_invalid");
    const entries: [string, FormValue][] = Array.isArray(v) ? v.map((x, i) => [String(i), x]) : Object.entries(v);
    const out: Record<string, string> = {};
    for (const [k, val] of entries) {
      const name = `${this.name(key)}[${k}]`;
      if (typeof val !== "string") throw invalidParam(name, `Invalid string: ${name} must be a string.`, "parameter_invalid_string");
      if (k.length > 40) throw invalidParam(name, `Metadata keys can be at most 40 characters long: ${k}`, "parameter_invalid");
      if (val.length > 500) throw invalidParam(name, `Metadata values can be at most 500 characters long.`, "parameter_invalid");
      out[k] = val;
    }
    return out;
  }
}

/** Applies a metadata update (see Params.metadata) to `current`, returning the new record. */
export function applyMetadata(current: Record<string, string>, update: Record<string, string> | null | undefined, param = "metadata"): Record<string, string> {
  if (update === undefined) return current;
  if (update === null) return {};
  const next = { ...current };
  for (const [k, v] of Object.entries(update)) {
    if (v === "") delete next[k];
    else next[k] = v;
  }
  if (Object.keys(next).length > 50) throw invalidParam(param, "You can have at most 50 metadata keys.", "parameter_invalid");
  return next;
}
