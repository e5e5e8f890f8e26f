// The plot components rendered to static markup (as the server renders them before hydration):
// SVG structure, labels, legend, accessibility attributes.
import { createElement as h } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import type { LinePlot, Plot } from "@/lib/calc/core/types";
import { BodePair, HistogramView, LevelsView, LinePlotView, PlotList, PlotView } from "@/app/_components/plots";
import { freqs, histogramPlot, levelsPlot, magnitudePlot, phasePlot } from "./fixtures";

const count = (html: string, re: RegExp) => (html.match(re) ?? []).length;
/** Text of every SVG <text> element, in order. */
const texts = (html: string) => [...html.matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]);
/** Attribute `name` of the first element whose opening tag contains `marker`. */
const attr = (html: string, marker: string, name: string) => {
  const tag = [...html.matchAll(/<[a-zA-Z][^>]*>/g)].map((m) => m[0]).find((t) => t.includes(marker));
  return tag ? new RegExp(`\\s${name}="([^"]*)"`).exec(tag)?.[1] : undefined;
};

describe("PlotView (line)", () => {
  const html = renderToStaticMarkup(h(PlotView, { plot: magnitudePlot() }));
  it("draws one path per series, in the role styles", () => {
    expect(count(html, /<path [^>]*data-role=/g)).toBe(3);
    expect(attr(html, 'data-role="ideal"', "stroke-dasharray")).toBe("6 4");
    expect(attr(html, 'data-role="real"', "class")).toBe("stroke-copper");
    expect(attr(html, 'data-role="limit"', "stroke-dasharray")).toBe("1.5 2.5");
  });
  it("labels decades with SI prefixes and the axes with units", () => {
    const t = texts(html);
    for (const label of ["10 Hz", "1 kHz", "100 kHz", "1 MHz", "10 MHz", "Gain (dB)", "Frequency (Hz)"]) expect(t).toContain(label);
  });
  it("has a legend entry per series and a closed data toggle", () => {
    expect(count(html, /<li /g)).toBe(3);
    expect(html).toContain("Ideal op-amp");
    expect(html).toContain("Stopband limit");
    expect(html).toMatch(/<button[^>]*aria-expanded="false"[^>]*>Show data<\/button>/);
    expect(html).not.toContain("<table");
  });
  it("is an image with a summary and can take focus", () => {
    const label = attr(html, 'role="img"', "aria-label");
    expect(label).toContain("Magnitude response. Gain in dB against frequency (log scale), 10 Hz to 10 MHz.");
    expect(attr(html, 'role="img"', "tabindex")).toBe("0");
    expect(html).not.toContain("data-cursor");
  });
  it("sizes by viewBox for the container's width, tabular digits, no external resources", () => {
    expect(attr(html, 'role="img"', "viewBox")).toBe("0 0 640 260");
    expect(html).toContain("font-variant-numeric:tabular-nums");
    expect(html).not.toMatch(/https?:\/\//);
  });
});

describe("edge cases of line plots", () => {
  it("breaks at NaN, drops x ≤ 0 on a log axis, dots a single point, skips an empty series", () => {
    const plot: LinePlot = {
      ...magnitudePlot(),
      series: [
        { name: "gap", role: "real", x: [0, -5, ...freqs], y: [0, 0, ...freqs.map((_, i) => (i > 100 && i < 120 ? NaN : -i / 10))] },
        { name: "one", role: "other", x: [1e5], y: [-30] },
        { name: "empty", role: "ideal", x: [], y: [] },
      ],
    };
    const html = renderToStaticMarkup(h(LinePlotView, { plot }));
    const d = attr(html, 'data-series="gap"', "d") ?? "";
    expect(count(d, /M/g)).toBe(2);
    expect(count(html, /data-dot=""/g)).toBe(1);
    expect(count(html, /<path [^>]*data-role=/g)).toBe(1);
    expect(html).not.toContain("NaN");
    expect(html).toMatch(/empty<\/span><span[^>]*>\(no points\)/);
    expect(count(html, /\(no points\)/g)).toBe(1);
  });
  it("says so when there is nothing to plot", () => {
    const html = renderToStaticMarkup(h(LinePlotView, { plot: { ...magnitudePlot(), series: [] } }));
    expect(texts(html)).toContain("No points to plot");
    expect(attr(html, 'role="img"', "aria-label")).toContain("No series.");
    // no invented scale and nothing to show as data
    expect(texts(html).filter((t) => /\d/.test(t))).toEqual([]);
    expect(html).not.toContain("Show data");
  });
  it("draws a linear x axis with a shared prefix (amplitude in V)", () => {
    const amps = Array.from({ length: 31 }, (_, i) => i * 0.5);
    const plot: Plot = {
      kind: "line",
      id: "power.dissipation",
      title: "Device dissipation against amplitude",
      x: { label: "Output amplitude", unit: "V", scale: "linear" },
      y: { label: "Dissipation", unit: "W", scale: "linear" },
      series: [{ name: "Class B", role: "real", x: amps, y: amps.map((v) => (15 * v) / (Math.PI * 8) - (v * v) / 16) }],
    };
    const t = texts(renderToStaticMarkup(h(PlotView, { plot })));
    expect(t).toContain("Output amplitude (V)");
    expect(t).toContain("15");
    expect(t.some((x) => x.startsWith("Dissipation ("))).toBe(true);
  });
});

describe("BodePair", () => {
  const html = renderToStaticMarkup(h(BodePair, { magnitude: magnitudePlot(), phase: phasePlot() }));
  it("draws two aligned plots with one frequency axis", () => {
    expect(count(html, /role="img"/g)).toBe(2);
    const t = texts(html);
    expect(t.filter((x) => x === "1 kHz")).toHaveLength(1); // x labels only under the phase plot
    expect(t.filter((x) => x === "Frequency (Hz)")).toHaveLength(1);
    expect(t).toContain("Gain (dB)");
    expect(t).toContain("Phase (°)");
    // same plot area left edge in both drawings (the clip rectangles)
    const clips = [...html.matchAll(/<clipPath[^>]*><rect x="([^"]+)"/g)].map((m) => m[1]);
    expect(clips).toHaveLength(2);
    expect(clips[0]).toBe(clips[1]);
  });
  it("merges the legend: one entry per series across both plots", () => {
    expect(count(html, /<li /g)).toBe(3);
    expect(count(html, /<path [^>]*data-role=/g)).toBe(5);
  });
  it("ticks phase in 45° or 90° steps", () => {
    const t = texts(html);
    expect(t).toContain("\u221290");
    expect(t).toContain("\u2212180");
  });
});

describe("HistogramView", () => {
  const html = renderToStaticMarkup(h(HistogramView, { plot: histogramPlot() }));
  it("draws a bar per bin and a labelled line per marker", () => {
    expect(count(html, /data-count=/g)).toBe(40);
    expect(count(html, /<line [^>]*data-marker=/g)).toBe(5);
    const t = texts(html);
    expect(t).toContain("target · nominal (chosen values) 20 kHz"); // 1 Hz apart: one label
    expect(t).toContain("99.865 % percentile 20.8 kHz");
    expect(t).toContain("Count (of 2000 samples)");
    expect(t).toContain("−3 dB frequency (kHz)");
  });
  it("summarises samples and bins and keys the line styles", () => {
    expect(attr(html, 'role="img"', "aria-label")).toContain("2000 samples in 40 bins");
    expect(html).toContain("Dashed: upper spec limit · dotted: 0.135 % percentile, 99.865 % percentile · solid: target, nominal (chosen values)");
  });
  it("says so when there are no samples", () => {
    const html0 = renderToStaticMarkup(h(HistogramView, { plot: { ...histogramPlot(), counts: new Array<number>(40).fill(0), markers: [] } }));
    expect(texts(html0)).toContain("No samples to plot");
  });
});

describe("LevelsView", () => {
  it("labels rails, bias and bands and says in words that the band fits", () => {
    const html = renderToStaticMarkup(h(LevelsView, { plot: levelsPlot() }));
    expect(count(html, /<g data-level=/g)).toBe(3);
    expect(count(html, /data-band=/g)).toBe(2);
    const t = texts(html);
    for (const label of ["V+", "V−", "mid-supply", "5.00 V", "2.50 V", "Voltage (V)"]) expect(t).toContain(label);
    expect(html).toMatch(/data-fit="fits"[^>]*><strong[^>]*>Fits<\/strong>/);
    expect(html).not.toContain("data-overshoot");
    expect(html).toContain("0.10 V to 4.90 V");
  });
  it("marks and labels what sticks out when it does not fit", () => {
    const html = renderToStaticMarkup(h(LevelsView, { plot: levelsPlot([0.05, 4.95]) }));
    expect(html).toMatch(/data-fit="does-not-fit"[^>]*><strong[^>]*>Does not fit<\/strong>/);
    expect(count(html, /data-overshoot=/g)).toBe(2);
    expect(texts(html)).toContain("▲ 50 mV outside");
    expect(attr(html, 'role="img"', "aria-label")).toContain("Does not fit");
  });
});

describe("PlotList", () => {
  it("draws the engine's plots with the Bode halves as one pair", () => {
    const html = renderToStaticMarkup(h(PlotList, { plots: [magnitudePlot(), phasePlot(), histogramPlot(), levelsPlot()] }));
    expect(count(html, /data-bode-pair=""/g)).toBe(1);
    expect(count(html, /data-plot-kind="line"/g)).toBe(2);
    expect(count(html, /data-plot-kind="histogram"/g)).toBe(1);
    expect(count(html, /data-plot-kind="levels"/g)).toBe(1);
    expect(count(html, /data-plot-figure=""/g)).toBe(3);
  });
});
