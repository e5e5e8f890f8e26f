/**
 * Small-signal AC solver by modified nodal analysis (MNA) for the circuits of circuit.ts.
 *
 * Unknowns: the voltage of every node except ground and the driven input, plus the output
 * current of every op-amp. An op-amp is a voltage-controlled voltage source
 * Vout = A(s)·(V+ − V−), written as V+ − V− − Vout/A(s) = 0, so the ideal op-amp (1/A = 0) and
 * the single-pole model A(s) = A0/(1 + s/ωp) share one code path. The op-amp output resistance is
 * zero (its data-sheet value is not modelled; see the calculation's assumptions).
 *
 * Reference: C.-W. Ho, A. E. Ruehli, P. A. Brennan, "The modified nodal approach to network
 * analysis", IEEE Trans. Circuits Syst. 22 (1975) 504–509.
 */
import { GROUND, type Circuit } from "./circuit";

/** Op-amp model for AC analysis. */
export type OpAmpModel = { kind: "ideal" } | { kind: "single-pole"; /** DC open-loop gain, V/V */ a0: number; /** Gain-bandwidth product, Hz */ gbw: number };

/** A compiled circuit: node indices resolved once, solved at many frequencies. */
export interface CompiledCircuit {
  /** Complex response V(output)/V(input) at angular frequency ω (rad/s): [re, im]. */
  solve(omega: number): [number, number];
}

/**
 * Compile a circuit for repeated AC solves.
 * @param circuit the circuit (input driven by a 1 V source)
 * @param model op-amp model applied to every op-amp
 */
export function compileCircuit(circuit: Circuit, model: OpAmpModel): CompiledCircuit {
  const index = new Map<string, number>();
  const nodeOf = (name: string): number => {
    if (name === GROUND) return -1;
    if (name === circuit.input) return -2;
    let i = index.get(name);
    if (i === undefined) {
      i = index.size;
      index.set(name, i);
    }
    return i;
  };
  const passives: Array<{ a: number; b: number; g: number; isC: boolean }> = [];
  const opamps: Array<{ p: number; m: number; o: number }> = [];
  for (const e of circuit.elements) {
    if (e.kind === "U") opamps.push({ p: nodeOf(e.plus), m: nodeOf(e.minus), o: nodeOf(e.out) });
    else passives.push({ a: nodeOf(e.a), b: nodeOf(e.b), g: e.kind === "R" ? 1 / e.value : e.value, isC: e.kind === "C" });
  }
  const outIdx = nodeOf(circuit.output);
  const nNodes = index.size;
  const n = nNodes + opamps.length;
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  const bre = new Float64Array(n);
  const bim = new Float64Array(n);
  const wp = model.kind === "single-pole" ? (2 * Math.PI * model.gbw) / model.a0 : 0;
  const xr = new Float64Array(n), xi = new Float64Array(n);

  return {
    solve(omega: number): [number, number] {
      re.fill(0); im.fill(0); bre.fill(0); bim.fill(0);
      const stamp = (r: number, c: number, yr: number, yi: number) => {
        re[r * n + c] += yr;
        im[r * n + c] += yi;
      };
      for (const { a, b, g, isC } of passives) {
        const yr = isC ? 0 : g;
        const yi = isC ? omega * g : 0;
        // input node (−2) is a known 1 V source: its terms go to the right-hand side
        if (a >= 0) {
          stamp(a, a, yr, yi);
          if (b >= 0) stamp(a, b, -yr, -yi);
          else if (b === -2) { bre[a] += yr; bim[a] += yi; }
        }
        if (b >= 0) {
          stamp(b, b, yr, yi);
          if (a >= 0) stamp(b, a, -yr, -yi);
          else if (a === -2) { bre[b] += yr; bim[b] += yi; }
        }
      }
      opamps.forEach(({ p, m, o }, k) => {
        const row = nNodes + k;
        // output current enters node o
        if (o >= 0) stamp(o, row, -1, 0);
        // V+ − V− − Vout·(1 + jω/ωp)/A0 = 0
        const known = (node: number, sign: number) => {
          if (node >= 0) stamp(row, node, sign, 0);
          else if (node === -2) bre[row] -= sign;
        };
        known(p, 1);
        known(m, -1);
        if (model.kind === "single-pole" && o >= 0) stamp(row, o, -1 / model.a0, -omega / (wp * model.a0));
      });
      // Gaussian elimination with partial pivoting (complex)
      for (let col = 0; col < n; col++) {
        let piv = col, best = -1;
        for (let r = col; r < n; r++) {
          const mag = Math.abs(re[r * n + col]) + Math.abs(im[r * n + col]);
          if (mag > best) { best = mag; piv = r; }
        }
        if (piv !== col) {
          for (let c = 0; c < n; c++) {
            const i1 = col * n + c, i2 = piv * n + c;
            let t = re[i1]; re[i1] = re[i2]; re[i2] = t;
            t = im[i1]; im[i1] = im[i2]; im[i2] = t;
          }
          let t = bre[col]; bre[col] = bre[piv]; bre[piv] = t;
          t = bim[col]; bim[col] = bim[piv]; bim[piv] = t;
        }
        const pr = re[col * n + col], pi = im[col * n + col];
        const pd = pr * pr + pi * pi;
        if (pd === 0) continue;
        for (let r = col + 1; r < n; r++) {
          const xr = re[r * n + col], xi = im[r * n + col];
          if (xr === 0 && xi === 0) continue;
          const fr = (xr * pr + xi * pi) / pd, fi = (xi * pr - xr * pi) / pd;
          for (let c = col; c < n; c++) {
            const yr = re[col * n + c], yi = im[col * n + c];
            re[r * n + c] -= fr * yr - fi * yi;
            im[r * n + c] -= fr * yi + fi * yr;
          }
          bre[r] -= fr * bre[col] - fi * bim[col];
          bim[r] -= fr * bim[col] + fi * bre[col];
        }
      }
      for (let r = n - 1; r >= 0; r--) {
        let sr = bre[r], si = bim[r];
        for (let c = r + 1; c < n; c++) {
          const ar = re[r * n + c], ai = im[r * n + c];
          sr -= ar * xr[c] - ai * xi[c];
          si -= ar * xi[c] + ai * xr[c];
        }
        const pr = re[r * n + r], pi = im[r * n + r];
        const pd = pr * pr + pi * pi;
        xr[r] = pd === 0 ? 0 : (sr * pr + si * pi) / pd;
        xi[r] = pd === 0 ? 0 : (si * pr - sr * pi) / pd;
      }
      if (outIdx === -2) return [1, 0];
      if (outIdx < 0) return [0, 0];
      return [xr[outIdx], xi[outIdx]];
    },
  };
}
