// Plot fixtures for the plot tests: the shapes the engine returns (lib/calc/filter/compute.ts).
import type { HistogramPlot, LevelsPlot, LinePlot } from "@/lib/calc/core/types";

/** 10 Hz … 10 MHz, 60 points per decade (361 points). */
export const freqs = Array.from({ length: 361 }, (_, i) => 10 * 10 ** (i / 60));

/** |H| in dB of a 2nd-order low-pass, f0 = 10 kHz, Q = 1/√2 (Butterworth). */
export function lowpassDb(f: number, f0 = 1e4, q = Math.SQRT1_2): number {
  const u = f / f0;
  return -10 * Math.log10((1 - u * u) ** 2 + (u / q) ** 2);
}

/** Phase in degrees of the same low-pass, 0 … −180°. */
export function lowpassPhase(f: number, f0 = 1e4, q = Math.SQRT1_2): number {
  const u = f / f0;
  return (-Math.atan2(u / q, 1 - u * u) * 180) / Math.PI;
}

export function magnitudePlot(id = "bode.magnitude"): LinePlot {
  return {
    kind: "line",
    id,
    title: "Magnitude response",
    x: { label: "Frequency", unit: "Hz", scale: "log" },
    y: { label: "Gain", unit: "dB", scale: "linear" },
    series: [
      { name: "Ideal op-amp", role: "ideal", x: freqs, y: freqs.map((f) => lowpassDb(f)) },
      { name: "LW-OA210 (GBW 1 MHz)", role: "real", x: freqs, y: freqs.map((f) => lowpassDb(f, 0.97e4)) },
      { name: "Stopband limit", role: "limit", x: [1e5, 1e7], y: [-40, -40] },
    ],
  };
}

export function phasePlot(id = "bode.phase"): LinePlot {
  return {
    kind: "line",
    id,
    title: "Phase response",
    x: { label: "Frequency", unit: "Hz", scale: "log" },
    y: { label: "Phase", unit: "°", scale: "linear" },
    series: [
      { name: "Ideal op-amp", role: "ideal", x: freqs, y: freqs.map((f) => lowpassPhase(f)) },
      { name: "LW-OA210 (GBW 1 MHz)", role: "real", x: freqs, y: freqs.map((f) => lowpassPhase(f, 0.97e4)) },
    ],
  };
}

/** 40 bins of 2 000 samples (a triangular spread), with the engine's markers. */
export function histogramPlot(): HistogramPlot {
  const bins = 40;
  const edges = Array.from({ length: bins + 1 }, (_, i) => 19e3 + i * 50);
  const counts = Array.from({ length: bins }, (_, i) => 100 - Math.abs(i - 19.5) * 5 + 0.5);
  const total = counts.reduce((a, c) => a + c, 0);
  counts[20] += 2000 - total; // exactly 2 000 samples
  return {
    kind: "histogram",
    id: "mc.f3db",
    title: "Monte Carlo spread of the −3 dB frequency",
    x: { label: "−3 dB frequency", unit: "Hz", scale: "linear" },
    edges,
    counts,
    markers: [
      { label: "target", value: 20e3 },
      { label: "nominal (chosen values)", value: 20.001e3 },
      { label: "0.135 % percentile", value: 19.2e3 },
      { label: "99.865 % percentile", value: 20.8e3 },
      { label: "upper spec limit", value: 20.9e3 },
    ],
  };
}

export function levelsPlot(required: [number, number] = [0.5, 4.5]): LevelsPlot {
  return {
    kind: "levels",
    id: "swing",
    title: "Output swing against the rails",
    unit: "V",
    levels: [
      { label: "V+", value: 5, role: "rail" },
      { label: "V−", value: 0, role: "rail" },
      { label: "mid-supply", value: 2.5, role: "bias" },
    ],
    bands: [
      { label: "LW-OA210 output range", from: 0.1, to: 4.9, role: "allowed" },
      { label: "Section 2 peak signal", from: required[0], to: required[1], role: "required" },
    ],
  };
}
