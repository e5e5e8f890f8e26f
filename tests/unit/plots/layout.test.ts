// Layout rules of the sheet's plots: which plots pair up, label spreading and placement, band
// fit, data tables. Expectations follow from the rules each function documents.
import { describe, expect, it } from "vitest";
import type { LinePlot } from "@/lib/calc/core/types";
import { bodeIdParts, groupPlots } from "@/app/_components/plots/bode";
import { histogramTables, levelsTables, lineTables, thinIndices } from "@/app/_components/plots/dataTable";
import { groupMarkers, layoutHistogram, markerKind, placeMarkerLabels } from "@/app/_components/plots/histogramLayout";
import { DB_SPAN_MAX, layoutLine } from "@/app/_components/plots/lineLayout";
import { layoutLevels, spreadLabels } from "@/app/_components/plots/levelsLayout";
import { bandFit, fitSentence, summariseHistogram, summariseLevels, summariseLine } from "@/app/_components/plots/summary";
import { histogramPlot, levelsPlot, magnitudePlot, phasePlot } from "./fixtures";

describe("Bode pairing", () => {
  const hist = histogramPlot();
  it("joins the engine's bode.magnitude and bode.phase", () => {
    const items = groupPlots([magnitudePlot(), phasePlot(), hist]);
    expect(items.map((i) => i.kind)).toEqual(["bode", "plot"]);
  });
  it("matches ids with a shared stem even when other plots lie between", () => {
    const items = groupPlots([magnitudePlot("loop-magnitude"), hist, magnitudePlot("bode-magnitude"), phasePlot("bode-phase"), phasePlot("loop-phase")]);
    expect(items.map((i) => (i.kind === "bode" ? `${i.magnitude.id}+${i.phase.id}` : i.plot.id))).toEqual(["loop-magnitude+loop-phase", "mc.f3db", "bode-magnitude+bode-phase"]);
  });
  it("pairs neighbours by units when ids do not say", () => {
    const items = groupPlots([magnitudePlot("gain"), phasePlot("angle")]);
    expect(items).toHaveLength(1);
    expect(items[0].kind).toBe("bode");
  });
  it("leaves plots alone whose axes do not fit a Bode pair", () => {
    const linearPhase: LinePlot = { ...phasePlot(), x: { label: "Frequency", unit: "Hz", scale: "linear" } };
    const delay: LinePlot = { ...phasePlot("bode.phase"), y: { label: "Group delay", unit: "s", scale: "linear" } };
    expect(groupPlots([magnitudePlot(), linearPhase]).map((i) => i.kind)).toEqual(["plot", "plot"]);
    expect(groupPlots([magnitudePlot(), delay]).map((i) => i.kind)).toEqual(["plot", "plot"]);
    // phase before magnitude is not a neighbour pair (rule 3 is magnitude then phase)
    expect(groupPlots([phasePlot("a"), magnitudePlot("b")]).map((i) => i.kind)).toEqual(["plot", "plot"]);
  });
  it("reads stems and halves from ids", () => {
    expect(bodeIdParts("bode.magnitude")).toEqual({ stem: "bode", half: "magnitude" });
    expect(bodeIdParts("Loop_Phase")).toEqual({ stem: "loop", half: "phase" });
    expect(bodeIdParts("group-delay")).toBeNull();
  });
});

describe("layoutLine", () => {
  it("lays out a Bode magnitude: decade labels, one path per series, dB title", () => {
    const l = layoutLine(magnitudePlot(), { width: 640, height: 260 });
    expect(l.x.ticks.filter((t) => t.text).map((t) => t.text)).toEqual(["10 Hz", "100 Hz", "1 kHz", "10 kHz", "100 kHz", "1 MHz", "10 MHz"]);
    // drawing order: limit, real, then the dashed ideal on top so both show where they coincide
    expect(l.series.map((s) => s.role)).toEqual(["limit", "real", "ideal"]);
    expect(l.series.every((s) => s.d.startsWith("M"))).toBe(true);
    expect(l.y.title).toBe("Gain (dB)");
    expect(l.x.title).toBe("Frequency (Hz)");
    // data reach −120 dB at 10 MHz and 0 dB in the passband; one step of headroom above 0 dB
    const ys = l.y.ticks.map((t) => t.value);
    expect(ys[0]).toBeLessThanOrEqual(-120);
    expect(ys[ys.length - 1]).toBeGreaterThan(0);
  });
  it("limits a dB axis to DB_SPAN_MAX below its top and says so", () => {
    const deep: LinePlot = { ...magnitudePlot(), series: [{ name: "deep", role: "real", x: [10, 100, 1000], y: [0, -3000, -6000] }] };
    const l = layoutLine(deep, { width: 640, height: 260 });
    expect(l.y.scale.domain[1] - l.y.scale.domain[0]).toBeLessThanOrEqual(DB_SPAN_MAX + 40);
    expect(l.note).toMatch(/below −\d+ dB are outside the view/);
  });
  it("reports an empty plot and a plot with only undrawable points as empty", () => {
    expect(layoutLine({ ...magnitudePlot(), series: [] }, { width: 400, height: 200 }).empty).toBe(true);
    const bad: LinePlot = { ...magnitudePlot(), series: [{ name: "x", x: [0, -1], y: [1, 2] }] };
    expect(layoutLine(bad, { width: 400, height: 200 }).empty).toBe(true);
  });
  it("draws a single point as a dot", () => {
    const one: LinePlot = { ...magnitudePlot(), series: [{ name: "one", role: "other", x: [1e4], y: [-3] }] };
    const l = layoutLine(one, { width: 400, height: 200 });
    expect(l.series[0].d).toBe("");
    expect(l.series[0].dots).toHaveLength(1);
    expect(l.empty).toBe(false);
  });
});

describe("spreadLabels", () => {
  it("centres a cluster on its wanted mean", () => {
    expect(spreadLabels([100, 102, 104], 10, 0, 300)).toEqual([92, 102, 112]);
  });
  it("keeps labels that are apart where they are and keeps the order", () => {
    expect(spreadLabels([50, 10, 200], 15, 0, 300)).toEqual([50, 10, 200]);
  });
  it("keeps labels within the bounds where they fit", () => {
    const out = spreadLabels([1, 2, 3], 10, 0, 100);
    expect(out).toEqual([0, 10, 20]);
    const low = spreadLabels([98, 99, 100], 10, 0, 100);
    expect(low).toEqual([80, 90, 100]);
  });
});

describe("histogram markers", () => {
  it("reads the line style from the label", () => {
    expect(markerKind("upper spec limit")).toBe("limit");
    expect(markerKind("99.865 % percentile")).toBe("percentile");
    expect(markerKind("P0.5")).toBe("percentile");
    expect(markerKind("nominal (chosen values)")).toBe("centre");
    expect(markerKind("target")).toBe("centre");
  });
  it("places labels so no two in a row overlap", () => {
    const items = [100, 104, 108, 300, 302].map((px, i) => ({ px, text: `marker ${i} 20.00 kHz` }));
    const placed = placeMarkerLabels(items, 40, 620);
    const spans = placed.map((p, i) => ({ row: p.row, a: p.anchor === "start" ? p.textX : p.textX - items[i].text.length * 6.6, w: items[i].text.length * 6.6 }));
    for (let i = 0; i < spans.length; i++)
      for (let j = i + 1; j < spans.length; j++) {
        if (spans[i].row !== spans[j].row) continue;
        const overlap = spans[i].a < spans[j].a + spans[j].w && spans[j].a < spans[i].a + spans[i].w;
        expect(overlap).toBe(false);
      }
    expect(new Set(placed.map((p) => p.row)).size).toBeGreaterThan(1);
  });
  it("puts a label left of its line near the right edge", () => {
    const [p] = placeMarkerLabels([{ px: 610, text: "upper spec limit 20.9 kHz" }], 40, 620);
    expect(p.anchor).toBe("end");
    expect(p.textX).toBe(606);
  });
  it("merges markers closer than 3 px into one label, sharing a value that reads the same", () => {
    const map = (v: number) => (v - 19e3) / 5;
    const g = groupMarkers([{ label: "target", value: 20e3 }, { label: "nominal", value: 20.001e3 }, { label: "limit", value: 21e3 }], map, "Hz");
    expect(g.map((x) => x.members)).toEqual([[0, 1], [2]]);
    expect(g[0].text).toBe("target · nominal 20 kHz"); // 20.001 kHz reads "20 kHz" at 4 figures
    const h = groupMarkers([{ label: "nominal", value: 20e3 }, { label: "mean", value: 20.01e3 }], map, "Hz");
    expect(h[0].text).toBe("nominal 20 kHz · mean 20.01 kHz");
  });
  it("keeps a label that fits on neither side of its line inside the area", () => {
    const text = "x".repeat(60); // 396 px wide
    const [p] = placeMarkerLabels([{ px: 300, text }], 40, 500);
    expect(p.anchor).toBe("start");
    expect(p.textX).toBeGreaterThanOrEqual(42);
    expect(p.textX + text.length * 6.6).toBeLessThanOrEqual(498);
  });
  it("lays out one bar per bin and a count axis that covers the fullest bin", () => {
    const plot = histogramPlot();
    const l = layoutHistogram(plot, { width: 640, height: 250 });
    expect(l.bars).toHaveLength(40);
    expect(l.total).toBe(2000);
    const maxCount = Math.max(...plot.counts);
    expect(l.y.scale.domain[1]).toBeGreaterThanOrEqual(maxCount);
    expect(l.y.title).toBe("Count (of 2000 samples)");
    expect(l.x.title).toBe("−3 dB frequency (kHz)");
    // the tallest bar stays below the marker label rows
    const lowestLabel = Math.max(...l.markers.filter((m) => m.text).map((m) => m.textY));
    const tallest = Math.min(...l.bars.map((b) => b.y));
    expect(tallest).toBeGreaterThan(lowestLabel);
  });
});

describe("levels", () => {
  it("says whether the required band fits, with the room at each end", () => {
    const fit = bandFit(levelsPlot())!;
    expect(fit.fits).toBe(true);
    expect(fit.spareTop).toBeCloseTo(0.4, 12); // 4.9 − 4.5
    expect(fit.spareBottom).toBeCloseTo(0.4, 12); // 0.5 − 0.1
    expect(fitSentence(fit, "V")).toBe("Fits: Section 2 peak signal (500 mV to 4.5 V) lies inside LW-OA210 output range (100 mV to 4.9 V), with 400 mV to spare at the top and 400 mV at the bottom.");
  });
  it("names how far a band that does not fit reaches out", () => {
    const fit = bandFit(levelsPlot([0.05, 4.6]))!;
    expect(fit.fits).toBe(false);
    expect(fitSentence(fit, "V", false)).toBe("Does not fit: Section 2 peak signal reaches 50 mV below LW-OA210 output range.");
    const l = layoutLevels(levelsPlot([0.05, 4.95]), { width: 520, height: 300 });
    expect(l.overshoots.map((o) => o.side)).toEqual(["top", "bottom"]);
    expect(l.overshoots[0].by).toBeCloseTo(0.05, 12);
  });
  it("has no verdict without both bands", () => {
    const p = levelsPlot();
    expect(bandFit({ ...p, bands: p.bands!.filter((b) => b.role === "allowed") })).toBeNull();
  });
  it("labels levels with aligned values and hatches beyond the rails", () => {
    const l = layoutLevels(levelsPlot(), { width: 520, height: 300 });
    expect(l.levels.map((x) => x.valueText)).toEqual(["5.00 V", "0.00 V", "2.50 V"]);
    expect(l.railTop).toBeLessThan(l.railBottom!);
    expect(l.fit?.fits).toBe(true);
  });
});

describe("summaries and tables", () => {
  it("summarise a line plot with its range and series", () => {
    const s = summariseLine(magnitudePlot());
    expect(s).toContain("Magnitude response. Gain in dB against frequency (log scale), 10 Hz to 10 MHz.");
    expect(s).toContain("3 series: Ideal op-amp (ideal):");
    expect(s).toContain("Stopband limit (limit): −40 dB.");
  });
  it("summarise a histogram and a levels plot", () => {
    expect(summariseHistogram(histogramPlot())).toContain("2000 samples in 40 bins from 19 kHz to 21 kHz");
    const l = summariseLevels(levelsPlot());
    expect(l).toContain("Levels: V+ 5 V, mid-supply 2.5 V, V− 0 V.");
    expect(l).toContain("Fits:");
  });
  it("thin long sweeps to every n-th sample and the last", () => {
    const idx = thinIndices(401, 41);
    expect(idx).toHaveLength(41);
    expect(idx.slice(0, 3)).toEqual([0, 10, 20]);
    expect(idx[40]).toBe(400);
    expect(thinIndices(5, 41)).toEqual([0, 1, 2, 3, 4]);
  });
  it("share a table between series on the same x samples", () => {
    const t = lineTables(magnitudePlot());
    expect(t).toHaveLength(2); // ideal + real on the sweep; the limit on its own two points
    expect(t[0].columns.map((c) => c.label)).toEqual(["Frequency", "Ideal op-amp", "LW-OA210 (GBW 1 MHz)"]);
    expect(t[0].rows[0][0]).toBe("10 Hz");
    expect(t[0].note).toBe("Every 9th of 361 samples, and the last.");
    expect(t[1].rows).toEqual([["100 kHz", "\u221240 dB"], ["10 MHz", "\u221240 dB"]]);
  });
});

describe("histogram and levels tables", () => {
  it("align each column to one prefix and one number of decimals", () => {
    const [bins, markers] = histogramTables(histogramPlot());
    // edges 19 000 … 21 000 Hz in 50 Hz steps, five figures in kHz
    expect(bins.rows[0]).toEqual(["19.000 kHz", "19.050 kHz", bins.rows[0][2], bins.rows[0][3]]);
    expect(bins.rows[39][1]).toBe("21.000 kHz");
    expect(bins.rows.every((r) => /^\d+\.\d{2} %$/.test(r[3]))).toBe(true);
    expect(bins.rows.reduce((a, r) => a + Number(r[2]), 0)).toBe(2000);
    expect(markers.rows[0]).toEqual(["target", "20 kHz"]);
    const [levels, bands] = levelsTables(levelsPlot());
    expect(levels.rows).toEqual([["V+", "rail", "5.000 V"], ["mid-supply", "bias", "2.500 V"], ["V−", "rail", "0.000 V"]]);
    expect(bands.rows[0]).toEqual(["LW-OA210 output range", "allowed", "0.100 V", "4.900 V"]);
  });
});
