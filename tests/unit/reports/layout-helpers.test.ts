import QRCode from "qrcode";
import { describe, expect, it } from "vitest";
import { axisScale, decadeLabel, fixed, linearAxis, logAxis, niceStep } from "@/pdf/plots/axes";
import { spreadLabels } from "@/pdf/plots/LevelsChart";
import { qrPath } from "@/pdf/parts/QrCode";
import { paragraphPieces } from "@/pdf/blocks";
import { formatMargin, formatTolerance, looksNumeric, urlWithoutScheme } from "@/pdf/text";

describe("plot axes", () => {
  it("picks 1-2-5 steps (the usual graph-paper sequence, common practice, no source)", () => {
    expect(niceStep(10, 5)).toBe(2);
    expect(niceStep(100, 5)).toBe(20);
    expect(niceStep(0.9, 5)).toBeCloseTo(0.2, 12);
    expect(niceStep(47, 5)).toBe(10);
  });

  it("covers the data with whole steps", () => {
    const ax = linearAxis(9.53, 10.61, 8);
    expect(ax.step).toBeCloseTo(0.2, 12);
    expect(ax.min).toBeCloseTo(9.4, 12);
    expect(ax.max).toBeCloseTo(10.8, 12);
    expect(ax.ticks.map((t) => fixed(t, 1))).toEqual(["9.4", "9.6", "9.8", "10.0", "10.2", "10.4", "10.6", "10.8"]);
    // A hair above a tick (e.g. +0.0001 dB of peaking) does not add a whole step.
    expect(linearAxis(-160, 1e-4, 8).max).toBe(0);
  });

  it("puts log axes on whole decades with 2…9 minor lines", () => {
    const ax = logAxis(100, 1e6);
    expect(ax.majors).toEqual([100, 1000, 10000, 100000, 1e6]);
    expect(ax.minors.length).toBe(4 * 8);
    expect(logAxis(150, 9000).majors).toEqual([100, 1000, 10000]);
  });

  it("labels decades with SI prefixes (IEC 80000-1 / SI brochure prefixes)", () => {
    expect([1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e-3].map((v) => decadeLabel(v, "Hz"))).toEqual(["1", "10", "100", "1k", "10k", "100k", "1M", "1m"]);
    expect(axisScale(10_540, "Hz")).toEqual({ factor: 1000, unit: "kHz" });
    expect(axisScale(2.5e-9, "V/√Hz")).toEqual({ factor: 1e-9, unit: "nV/√Hz" });
    expect(axisScale(120, "dB")).toEqual({ factor: 1, unit: "dB" });
  });

  it("prints a true minus sign and no negative zero", () => {
    expect(fixed(-45, 0)).toBe("−45");
    expect(fixed(-0.0001, 1)).toBe("0.0");
  });

  it("spreads close level labels apart and keeps them inside the plot", () => {
    const y = spreadLabels([10, 11, 12, 50, 99], 8, 3, 100);
    for (let i = 1; i < y.length; i++) expect(y[i] - y[i - 1]).toBeGreaterThanOrEqual(8 - 1e-9);
    expect(y[0]).toBe(10);
    expect(Math.max(...y)).toBeLessThanOrEqual(100);
    const crowded = spreadLabels([95, 96, 97, 98], 8, 3, 100);
    expect(crowded[3]).toBe(100);
    expect(crowded[0]).toBe(76);
  });
});

describe("QR code drawing", () => {
  it("draws exactly the dark modules the qrcode package computes", () => {
    const text = "https://app.loopwright.example/verify?code=LW-7K3Q-9XPA";
    const { d, size } = qrPath(text);
    const drawn = new Set<string>();
    for (const m of d.matchAll(/M(\d+) (\d+)h(\d+)v1h-\d+z/g)) {
      const [x, y, w] = [Number(m[1]), Number(m[2]), Number(m[3])];
      for (let i = 0; i < w; i++) drawn.add(`${x + i},${y}`);
    }
    const modules = QRCode.create(text, { errorCorrectionLevel: "M" }).modules;
    expect(size).toBe(modules.size);
    const dark = new Set<string>();
    for (let y = 0; y < size; y++) for (let x = 0; x < size; x++) if (modules.get(y, x)) dark.add(`${x},${y}`);
    expect(drawn).toEqual(dark);
    // The three finder patterns (ISO/IEC 18004): 7×7 dark border at three corners.
    for (const [ox, oy] of [[0, 0], [size - 7, 0], [0, size - 7]]) {
      for (let i = 0; i < 7; i++) {
        expect(dark.has(`${ox + i},${oy}`)).toBe(true);
        expect(dark.has(`${ox},${oy + i}`)).toBe(true);
      }
      expect(dark.has(`${ox + 1},${oy + 1}`)).toBe(false);
    }
  });
});

describe("report wording helpers", () => {
  it("prints margins and tolerances with signs and the percent sign spaced (SI brochure, 5.4.7)", () => {
    expect(formatMargin(0.234)).toBe("+23 %");
    expect(formatMargin(-0.045)).toBe("−4.5 %");
    expect(formatMargin(undefined)).toBe("—");
    expect(formatTolerance(0.01)).toBe("±1 %");
    expect(formatTolerance(0.001)).toBe("±0.1 %");
    expect(formatTolerance(undefined)).toBe("—");
  });

  it("tells numbers from names", () => {
    expect(looksNumeric("4.70")).toBe(true);
    expect(looksNumeric("−0.35")).toBe(true);
    expect(looksNumeric("±1.80")).toBe(true);
    expect(looksNumeric("LW-OA320")).toBe(false);
    expect(looksNumeric("Sallen-Key")).toBe(false);
  });

  it("shortens the verify address for the footer", () => {
    expect(urlWithoutScheme("https://app.loopwright.example/verify?code=LW-7K3Q-9XPA")).toBe("app.loopwright.example/verify");
  });

  it("splits paragraphs at blank lines and long ones at sentence ends", () => {
    expect(paragraphPieces("One.\n\nTwo\nlines.")).toEqual([
      { text: "One.", continues: false },
      { text: "Two lines.", continues: false },
    ]);
    const long = Array.from({ length: 40 }, (_, i) => `Sentence number ${i} is here.`).join(" ");
    const pieces = paragraphPieces(long, 200);
    expect(pieces.length).toBeGreaterThan(1);
    expect(pieces[0].continues).toBe(false);
    expect(pieces.slice(1).every((p) => p.continues)).toBe(true);
    for (const p of pieces) expect(p.text.length).toBeLessThanOrEqual(200);
    expect(pieces.map((p) => p.text).join(" ")).toBe(long);
    // A single sentence longer than the limit is cut at spaces.
    const run = "word ".repeat(100).trim();
    expect(paragraphPieces(run, 60).every((p) => p.text.length <= 60)).toBe(true);
  });
});

describe("word breaking", () => {
  it("keeps ordinary words, part names and values whole", async () => {
    const { breakOnlyLongWords } = await import("@/pdf/fonts");
    for (const w of ["LW-OA320", "Sallen-Key", "4.7", "kΩ", "filter.lowpass@1.3.0", "LW-7K3Q-9XPA"]) expect(breakOnlyLongWords(w)).toEqual([w]);
  });

  it("cuts only over-long tokens, never next to a hyphen, and loses no character", async () => {
    const { breakOnlyLongWords } = await import("@/pdf/fonts");
    const word = "HAD-2291-0042-REV-CONTROL-SHEET";
    const pieces = breakOnlyLongWords(word);
    expect(pieces.length).toBeGreaterThan(1);
    expect(pieces.join("")).toBe(word);
    for (const p of pieces) {
      expect(p.endsWith("-")).toBe(false);
      expect(p.startsWith("-")).toBe(false);
    }
  });
});
