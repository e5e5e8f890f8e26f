/**
 * Scalar formulas written once as mathjs expressions. The same parsed expression is evaluated
 * for the result and printed for the report (symbolically, and with the values substituted and
 * formatted with units), so what the report shows is what was computed.
 *
 * Expressions compute in SI base units with plain numbers (no mathjs units). Each expression
 * string is parsed and compiled once and cached for the life of the process.
 *
 * @example
 * const f = new FormulaSheet();
 * const ng = f.eval(
 *   { key: "NG", label: "Noise gain", symbol: "NG", expr: "1 + Rf / Rg", unit: "V/V" },
 *   { Rf: { value: 10e3, unit: "Ω" }, Rg: { value: 4.7e3, unit: "Ω" } },
 * );
 * // f.records[0].substituted === "NG = 1 + 10 kΩ / 4.7 kΩ"
 * const fb = f.eval({ key: "fB", label: "Closed-loop bandwidth", symbol: "f₋₃dB", expr: "GBW / NG", unit: "Hz" },
 *   { GBW: { value: 1e6, unit: "Hz" } }); // NG is the earlier result
 */
import { create, all, type EvalFunction, type MathNode } from "mathjs";
import type { Check, FormulaRecord } from "./types";
import { formatQuantity } from "./units";

const math = create(all, { predictable: true });

/** A value with its unit, as a formula variable. */
export interface Quantity {
  /** Value in SI base units (a fraction when `scale` is set). */
  value: number;
  /** Unit symbol, e.g. "Ω", "Hz", "V/V", "" for dimensionless. */
  unit: string;
  /** Symbol printed in the report, e.g. "Rf"; defaults to the variable name. */
  symbol?: string;
  /** Show a fraction as % / ppm when substituted. */
  scale?: "percent" | "ppm";
  /** Significant figures when substituted (default 4). */
  digits?: number;
}

/** A variable given to {@link FormulaSheet.eval}: a Quantity, or a bare dimensionless number. */
export type FormulaVar = Quantity | number;

/** Description of one formula. */
export interface FormulaSpec {
  /** Result key and the variable name later expressions use; must be a plain identifier. */
  key: string;
  label: string;
  /** Left-hand side symbol as printed, e.g. "NG", "f₋₃dB". */
  symbol: string;
  /** mathjs expression over SI numbers, e.g. "1 + Rf / Rg". */
  expr: string;
  /** Unit of the result, e.g. "V/V", "Hz" (for `scale` "percent": "%"). */
  unit: string;
  /** Source of the formula (book, edition, chapter/equation). */
  reference?: string;
  /** The expression yields a fraction to be recorded as % / ppm. */
  scale?: "percent" | "ppm";
  /** Significant figures in the printed forms (default 4). */
  digits?: number;
}

interface Compiled {
  code: EvalFunction;
  /** Free variables of the expression. */
  symbols: string[];
  /** Print template: text parts at even indices, variable slots at odd ("!" = parenthesise a
   * quantity, "~" = never parenthesise). */
  parts: string[];
}

const SLOT = "\u0001";
const CONSTANTS: Record<string, string> = { pi: "π", e: "e", Infinity: "∞" };
const FUNCTION_NAMES: Record<string, string> = { sqrt: "√", log10: "log₁₀", log: "ln", atan: "atan", abs: "abs", exp: "exp" };
const IDENT = /^[A-Za-z_][A-Za-z0-9_]*$/;
const cache = new Map<string, Compiled>();

function printNode(node: MathNode): string {
  return node.toString({
    parenthesis: "keep",
    implicit: "show",
    handler: (n: MathNode, options: object): string | undefined => {
      if (math.isSymbolNode(n)) {
        if (n.name in CONSTANTS) return CONSTANTS[n.name];
        return `${SLOT}${n.name}${SLOT}`;
      }
      if (math.isFunctionNode(n)) {
        const name = n.fn.name;
        const shown = FUNCTION_NAMES[name] ?? name;
        // A bare variable as a function argument needs no parentheses of its own: "abs(−2 V)".
        const args = n.args.map((a) => (math.isSymbolNode(a) && !(a.name in CONSTANTS) ? `${SLOT}~${a.name}${SLOT}` : a.toString(options)));
        return `${shown}(${args.join(", ")})`;
      }
      if (math.isOperatorNode(n) && n.fn === "pow" && math.isSymbolNode(n.args[0]) && !(n.args[0].name in CONSTANTS)) {
        return `${SLOT}!${n.args[0].name}${SLOT}^${n.args[1].toString(options)}`;
      }
      if (math.isOperatorNode(n) && n.fn === "unaryMinus" && math.isSymbolNode(n.args[0]) && !(n.args[0].name in CONSTANTS)) {
        return `−${SLOT}!${n.args[0].name}${SLOT}`;
      }
      return undefined;
    },
  });
}

/**
 * Parse and compile an expression once (cached by its text).
 * @param expr mathjs expression over plain numbers
 * @returns the compiled code, its free variables and its print template
 * @throws Error when the expression does not parse (a programming error, never user input)
 */
export function compileFormula(expr: string): Compiled {
  const hit = cache.get(expr);
  if (hit) return hit;
  const node = math.parse(expr);
  const symbols = new Set<string>();
  node.traverse((n: MathNode, _path: string, parent: MathNode | null) => {
    if (math.isSymbolNode(n) && !(parent && math.isFunctionNode(parent) && parent.fn === n) && !(n.name in CONSTANTS)) {
      symbols.add(n.name);
    }
  });
  const text = printNode(node)
    .replace(/ \* /g, " · ")
    .replace(/ - /g, " − ");
  const compiled: Compiled = { code: node.compile(), symbols: [...symbols], parts: text.split(SLOT) };
  cache.set(expr, compiled);
  return compiled;
}

function toQuantity(v: FormulaVar): Quantity {
  return typeof v === "number" ? { value: v, unit: "" } : v;
}

/**
 * Formatted text of each variable, per digits: a variable is printed in many formulas. The entry
 * remembers what it was made from, so a Quantity object changed by its owner is re-formatted.
 */
const formatted = new WeakMap<Quantity, Map<number, { value: number; unit: string; scale?: string; text: string }>>();

function formatOnce(q: Quantity, digits: number): string {
  const d = q.digits ?? digits;
  let m = formatted.get(q);
  if (!m) {
    m = new Map();
    formatted.set(q, m);
  }
  const hit = m.get(d);
  if (hit && hit.value === q.value && hit.unit === q.unit && hit.scale === q.scale) return hit.text;
  const text = formatQuantity(q.value, q.unit, { digits: d, scale: q.scale });
  m.set(d, { value: q.value, unit: q.unit, scale: q.scale, text });
  return text;
}

function formatVar(q: Quantity, digits: number, strong: boolean): string {
  const s = formatOnce(q, digits);
  const negative = q.value < 0;
  const hasUnit = q.unit !== "" || q.scale !== undefined;
  return negative || (strong && hasUnit) ? `(${s})` : s;
}

/** A formula whose value was not a finite number. */
export interface NonFiniteFormula {
  key: string;
  label: string;
  symbol: string;
  expression: string;
  /** What came out: "NaN", "Infinity", "-Infinity" or "not a number". */
  got: string;
  /** The variables that fed it, formatted, e.g. "Rg = 0 Ω". */
  inputs: string[];
}

/**
 * A sheet of formulas evaluated in order. Each result becomes a variable (under its key) for
 * later expressions. `records` holds every evaluation for the report; `nonFinite` lists any whose
 * value was not finite (its record then carries 0, and `nonFiniteChecks()` turns each into a
 * failing check).
 */
export class FormulaSheet {
  /** Every formula evaluated, in order. */
  readonly records: FormulaRecord[] = [];
  /** Formulas whose result was NaN or infinite. */
  readonly nonFinite: NonFiniteFormula[] = [];
  private readonly vars = new Map<string, Quantity>();

  /**
   * @param vars variables available to every formula of the sheet (inputs, constants)
   */
  constructor(vars: Record<string, FormulaVar> = {}) {
    this.define(vars);
  }

  /** Add or replace variables for the formulas that follow. */
  define(vars: Record<string, FormulaVar>): void {
    for (const [k, v] of Object.entries(vars)) this.vars.set(k, toQuantity(v));
  }

  /** The current value of a variable or earlier result (SI; a fraction for scaled results). */
  value(name: string): number {
    const q = this.vars.get(name);
    if (!q) throw new Error(`FormulaSheet: no variable "${name}"`);
    return q.value;
  }

  /** True when every formula so far gave a finite value. */
  get ok(): boolean {
    return this.nonFinite.length === 0;
  }

  /**
   * Evaluate one formula, record it, and make its result available as variable `spec.key`.
   * @param spec the formula
   * @param vars extra variables for this formula (override sheet variables of the same name)
   * @returns the value (SI base units; a fraction when `spec.scale` is set). May be non-finite:
   *   test with Number.isFinite or read `nonFinite` / `ok`.
   * @throws Error for a programming error: a malformed key or an undefined variable
   */
  eval(spec: FormulaSpec, vars: Record<string, FormulaVar> = {}): number {
    if (!IDENT.test(spec.key)) throw new Error(`FormulaSheet: key "${spec.key}" is not an identifier`);
    const compiled = compileFormula(spec.expr);
    const scope: Record<string, number> = {};
    const used: Record<string, Quantity> = {};
    for (const name of compiled.symbols) {
      const local = vars[name];
      const q = local !== undefined ? toQuantity(local) : this.vars.get(name);
      if (!q) throw new Error(`FormulaSheet: "${spec.expr}" uses "${name}", which is not defined`);
      scope[name] = q.value;
      used[name] = q;
    }
    let raw: unknown;
    try {
      raw = compiled.code.evaluate(scope);
    } catch {
      raw = NaN;
    }
    const value = typeof raw === "number" ? raw : NaN;
    const digits = spec.digits ?? 4;
    let symbolic = "";
    let substituted = "";
    const parts = compiled.parts;
    for (let i = 0; i < parts.length; i++) {
      if (i % 2 === 0) {
        symbolic += parts[i];
        substituted += parts[i];
      } else {
        const mark = parts[i][0];
        const strong = mark === "!";
        const bare = mark === "~";
        const name = strong || bare ? parts[i].slice(1) : parts[i];
        const q = used[name];
        symbolic += q.symbol ?? name;
        substituted += bare ? formatOnce(q, digits) : formatVar(q, digits, strong);
      }
    }
    const finite = Number.isFinite(value);
    if (!finite) {
      this.nonFinite.push({
        key: spec.key,
        label: spec.label,
        symbol: spec.symbol,
        expression: spec.expr,
        got: typeof raw === "number" ? String(raw) : "not a number",
        inputs: compiled.symbols.map((n) => `${used[n].symbol ?? n} = ${formatQuantity(used[n].value, used[n].unit, { scale: used[n].scale })}`),
      });
    }
    const factor = spec.scale === "percent" ? 100 : spec.scale === "ppm" ? 1e6 : 1;
    const recordUnit = spec.scale === "percent" ? "%" : spec.scale === "ppm" ? (spec.unit === "ppm/°C" ? "ppm/°C" : "ppm") : spec.unit;
    this.records.push({
      key: spec.key,
      label: spec.label,
      symbol: spec.symbol,
      expression: spec.expr,
      symbolic: `${spec.symbol} = ${symbolic}`,
      substituted: `${spec.symbol} = ${substituted}${finite ? "" : " (no finite value)"}`,
      value: finite ? value * factor : 0,
      unit: recordUnit,
      ...(spec.reference ? { reference: spec.reference } : {}),
    });
    this.vars.set(spec.key, { value, unit: spec.unit, symbol: spec.symbol, scale: spec.scale });
    return value;
  }

  /**
   * One failing check per non-finite formula, saying which formula and which inputs fed it.
   * @param prefix id prefix, default "formula"
   */
  nonFiniteChecks(prefix = "formula"): Check[] {
    return this.nonFinite.map((f) => ({
      id: `${prefix}.${f.key}`,
      severity: "fail" as const,
      title: `${f.label} cannot be computed`,
      message: `${f.label} (${f.symbol} = ${f.expression}) has no finite value (${f.got}) for ${f.inputs.join(", ") || "these inputs"}; the specification cannot be met as entered, so change the inputs that feed it.`,
      margin: -1,
    }));
  }
}
