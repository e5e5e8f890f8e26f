/**
 * Decoder for the form encoding the Stripe SDK sends (`application/x-www-form-urlencoded`
 * with bracketed keys): `line_items[0][price]=p`, `metadata[k]=v`, `expand[]=x` or
 * `expand[0]=x`. Values stay strings; each endpoint converts and validates its own params.
 */

/** A decoded parameter value: a string, a nested record, or an array of values. */
export type FormValue = string | FormValue[] | { [key: string]: FormValue };
/** Decoded top-level parameters. */
export type FormParams = { [key: string]: FormValue };

/** Thrown for a key the decoder cannot place (e.g. `a=1&a[b]=2`). */
export class FormDecodeError extends Error {
  constructor(
    message: string,
    readonly param: string,
  ) {
    super(message);
  }
}

/** Splits `a[b][0][]` into `["a", "b", "0", ""]`. A key without brackets is one segment. */
export function splitKey(key: string): string[] {
  const open = key.indexOf("[");
  if (open <= 0) return [key];
  const segments = [key.slice(0, open)];
  const re = /\[([^\]]*)\]/g;
  re.lastIndex = open;
  let m: RegExpExecArray | null;
  let end = open;
  while ((m = re.exec(key)) !== null) {
    if (m.index !== end) break;
    segments.push(m[1]);
    end = re.lastIndex;
  }
  // Trailing text after the last bracket is kept as part of the last segment (as qs does not
  // error either); in practice the SDK never produces it.
  if (end < key.length) segments[segments.length - 1] += key.slice(end);
  return segments;
}

type Node = { [key: string]: Node | string } | string;

/**
 * Decodes a form body or query string into nested params. Records whose keys are all
 * non-negative integers (or that were built with `[]`) become arrays, ordered by index.
 */
export function decodeForm(input: string): FormParams {
  const root: { [key: string]: Node } = {};
  const appendCounters = new WeakMap<object, number>();
  const search = new URLSearchParams(input);
  for (const [rawKey, value] of search) {
    if (rawKey === "") continue;
    const segments = splitKey(rawKey);
    let node: { [key: string]: Node } = root;
    for (let i = 0; i < segments.length; i++) {
      let seg = segments[i];
      if (seg === "") {
        // `[]`: append at the next free index of this array.
        const next = appendCounters.get(node) ?? Object.keys(node).length;
        appendCounters.set(node, next + 1);
        seg = String(next);
      }
      const last = i === segments.length - 1;
      if (last) {
        if (typeof node[seg] === "object") throw new FormDecodeError(`Invalid value for ${rawKey}: it is also used as a nested parameter.`, rawKey);
        node[seg] = value;
      } else {
        const child = node[seg];
        if (child === undefined) {
          const fresh: { [key: string]: Node } = {};
          node[seg] = fresh;
          node = fresh;
        } else if (typeof child === "string") {
          // `metadata=""` followed by `metadata[k]=v`: the nested form wins.
          if (child !== "") throw new FormDecodeError(`Invalid value for ${rawKey}: ${segments.slice(0, i + 1).join(".")} is both a value and a hash.`, rawKey);
          const fresh: { [key: string]: Node } = {};
          node[seg] = fresh;
          node = fresh;
        } else {
          node = child;
        }
      }
    }
  }
  return toValue(root) as FormParams;
}

function toValue(node: Node): FormValue {
  if (typeof node === "string") return node;
  const keys = Object.keys(node);
  if (keys.length > 0 && keys.every((k) => /^(0|[1-9]\d*)$/.test(k))) {
    return keys
      .map(Number)
      .sort((a, b) => a - b)
      .map((k) => toValue(node[String(k)]));
  }
  const out: { [key: string]: FormValue } = {};
  for (const k of keys) out[k] = toValue(node[k]);
  return out;
}
