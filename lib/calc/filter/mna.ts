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
  /**
   * Response and its derivative with respect to ω at ω (rad/s): [re, im, d re/dω, d im/dω],
   * the derivative from one extra substitution with the same LU factors:
   * A(ω)·x = b(ω) with A = G + jω·K, b = b_G + jω·b_K gives x' = A⁻¹·j·(b_K − K·x).
   */
  solveWithDerivative(omega: number): [number, number, number, number];
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
  // A(ω) = G + jω·K, b(ω) = bG + jω·bK, all real and constant
  const G = new Float64Array(n * n), K = new Float64Array(n * n);
  const bG = new Float64Array(n), bK = new Float64Array(n);
  for (const { a, b, g, isC } of passives) {
    const M = isC ? K : G;
    const rhs = isC ? bK : bG;
    // the input node (−2) is a known 1 V source: its terms go to the right-hand side
    if (a >= 0) {
      M[a * n + a] += g;
      if (b >= 0) M[a * n + b] -= g;
      else if (b === -2) rhs[a] += g;
    }
    if (b >= 0) {
      M[b * n + b] += g;
      if (a >= 0) M[b * n + a] -= g;
      else if (a === -2) rhs[b] += g;
    }
  }
  const wp = model.kind === "single-pole" ? (2 * Math.PI * model.gbw) / model.a0 : 0;
  opamps.forEach(({ p, m, o }, k) => {
    const row = nNodes + k;
    if (o >= 0) G[o * n + row] -= 1; // output current enters node o
    // V+ − V− − Vout·(1 + jω/ωp)/A0 = 0
    const known = (node: number, sign: number) => {
      if (node >= 0) G[row * n + node] += sign;
      else if (node === -2) bG[row] -= sign;
    };
    known(p, 1);
    known(m, -1);
    if (model.kind === "single-pole" && o >= 0) {
      G[row * n + o] -= 1 / model.a0;
      K[row * n + o] -= 1 / (wp * model.a0);
    }
  });

  const lr = new Float64Array(n * n), li = new Float64Array(n * n);
  const perm = new Int32Array(n);
  const yr = new Float64Array(n), yi = new Float64Array(n);
  const xr = new Float64Array(n), xi = new Float64Array(n);
  const vr = new Float64Array(n), vi = new Float64Array(n);

  /** LU factors of A(ω) with partial pivoting, in place in lr/li (unit lower triangle below). */
  const factor = (omega: number) => {
    for (let i = 0; i < n * n; i++) {
      lr[i] = G[i];
      li[i] = omega * K[i];
    }
    for (let i = 0; i < n; i++) perm[i] = i;
    for (let col = 0; col < n; col++) {
      let piv = col, best = -1;
      for (let r = col; r < n; r++) {
        const mag = Math.abs(lr[r * n + col]) + Math.abs(li[r * n + col]);
        if (mag > best) { best = mag; piv = r; }
      }
      if (piv !== col) {
        for (let c = 0; c < n; c++) {
          const i1 = col * n + c, i2 = piv * n + c;
          let t = lr[i1]; lr[i1] = lr[i2]; lr[i2] = t;
          t = li[i1]; li[i1] = li[i2]; li[i2] = t;
        }
        const t = perm[col]; perm[col] = perm[piv]; perm[piv] = t;
      }
      const pr = lr[col * n + col], pi = li[col * n + col];
      const pd = pr * pr + pi * pi;
      if (pd === 0) continue;
      for (let r = col + 1; r < n; r++) {
        const ar = lr[r * n + col], ai = li[r * n + col];
        if (ar === 0 && ai === 0) continue;
        const fr = (ar * pr + ai * pi) / pd, fi = (ai * pr - ar * pi) / pd;
        lr[r * n + col] = fr;
        li[r * n + col] = fi;
        for (let c = col + 1; c < n; c++) {
          const ur = lr[col * n + c], ui = li[col * n + c];
          lr[r * n + c] -= fr * ur - fi * ui;
          li[r * n + c] -= fr * ui + fi * ur;
        }
      }
    }
  };
  /** Solve with the current factors: right-hand side (br, bi) → (outR, outI). */
  const substitute = (br: Float64Array, bi: Float64Array, outR: Float64Array, outI: Float64Array) => {
    for (let r = 0; r < n; r++) {
      let sr = br[perm[r]], si = bi[perm[r]];
      for (let c = 0; c < r; c++) {
        const fr = lr[r * n + c], fi = li[r * n + c];
        sr -= fr * yr[c] - fi * yi[c];
        si -= fr * yi[c] + fi * yr[c];
      }
      yr[r] = sr;
      yi[r] = si;
    }
    for (let r = n - 1; r >= 0; r--) {
      let sr = yr[r], si = yi[r];
      for (let c = r + 1; c < n; c++) {
        const ar = lr[r * n + c], ai = li[r * n + c];
        sr -= ar * outR[c] - ai * outI[c];
        si -= ar * outI[c] + ai * outR[c];
      }
      const pr = lr[r * n + r], pi = li[r * n + r];
      const pd = pr * pr + pi * pi;
      outR[r] = pd === 0 ? 0 : (sr * pr + si * pi) / pd;
      outI[r] = pd === 0 ? 0 : (si * pr - sr * pi) / pd;
    }
  };
  const solveX = (omega: number) => {
    factor(omega);
    for (let i = 0; i < n; i++) {
      vr[i] = bG[i];
      vi[i] = omega * bK[i];
    }
    substitute(vr, vi, xr, xi);
  };
  const dxr = new Float64Array(n), dxi = new Float64Array(n);

  return {
    solve(omega: number): [number, number] {
      if (outIdx === -2) return [1, 0];
      if (outIdx < 0) return [0, 0];
      solveX(omega);
      return [xr[outIdx], xi[outIdx]];
    },
    solveWithDerivative(omega: number): [number, number, number, number] {
      if (outIdx === -2) return [1, 0, 0, 0];
      if (outIdx < 0) return [0, 0, 0, 0];
      solveX(omega);
      // v = bK − K·x (complex), rhs = j·v
      for (let r = 0; r < n; r++) {
        let sr = bK[r], si = 0;
        for (let c = 0; c < n; c++) {
          const k = K[r * n + c];
          if (k !== 0) { sr -= k * xr[c]; si -= k * xi[c]; }
        }
        vr[r] = -si;
        vi[r] = sr;
      }
      substitute(vr, vi, dxr, dxi);
      return [xr[outIdx], xi[outIdx], dxr[outIdx], dxi[outIdx]];
    },
  };
}
