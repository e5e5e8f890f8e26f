import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { formatNumber, formatQuantity, parseQuantity } from "@/lib/calc/core/units";

function ok(text: string, unit: string, scale?: "percent" | "ppm"): number {
  const r = parseQuantity(text, { unit, scale });
  if (!r.ok) throw new Error(`expected "${text}" to parse: ${r.message}`);
  return r.value;
}

describe("parseQuantity: SI prefixes and units", () => {
  // Prefix powers: SI Brochure, 9th ed. (BIPM 2019), Table 7.
  it.each([
    ["10n", "F", 10e-9],
    ["2.2 µF", "F", 2.2e-6],
    ["2.2 μF", "F", 2.2e-6], // Greek mu typed instead of the micro sign
    ["2.2uF", "F", 2.2e-6],
    ["1.5MHz", "Hz", 1.5e6],
    ["10 kHz", "Hz", 10e3],
    ["4.7k", "Ω", 4.7e3],
    ["100 Ω", "Ω", 100],
    ["100 ohm", "Ω", 100],
    ["3.3V", "V", 3.3],
    ["500 mV", "V", 0.5],
    ["1e-9", "", 1e-9],
    ["-12", "V", -12],
    ["−12 V", "V", -12], // real minus sign
    ["+15 V", "V", 15],
    ["1mF", "F", 1e-3], // "m" is milli, case-sensitive
    ["1M", "Ω", 1e6], // "M" is mega
    ["2 fA", "A", 2e-15],
    ["20 V/µs", "V/s", 20e6],
    ["0.5V/us", "V/s", 0.5e6],
    ["10 nV/√Hz", "V/√Hz", 10e-9],
    ["1 pA/rtHz", "A/√Hz", 1e-12],
    ["2 µV/°C", "V/°C", 2e-6],
    ["1.5 K/W", "K/W", 1.5],
    ["1.5 °C/W", "K/W", 1.5],
    ["1k", "V/V", 1000],
    ["100 dB", "dB", 100],
    ["25", "°C", 25],
    ["-40 °C", "°C", -40],
    ["1.5×10⁻⁹", "F", 1.5e-9], // as formatNumber writes extreme magnitudes
    ["1.5x10^-9", "F", 1.5e-9],
    ["10 000", "Ω", NaN],
  ])("%s in a %s field → %d", (text, unit, expected) => {
    const r = parseQuantity(text, { unit });
    if (Number.isNaN(expected)) {
      expect(r.ok).toBe(false);
      return;
    }
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.value).toBeCloseTo(expected, 15 - Math.ceil(Math.log10(Math.abs(expected) || 1)));
    if (r.ok) expect(Math.abs(r.value / expected - 1)).toBeLessThan(1e-12); // exact up to binary rounding
  });

  it("percent and ppm fields give a fraction", () => {
    // Definitions: 1 % = 1e-2, 1 ppm = 1e-6 (SI Brochure 9th ed., §5.4.7).
    expect(ok("1", "%", "percent")).toBe(0.01);
    expect(ok("1 %", "%", "percent")).toBe(0.01);
    expect(ok("0.1%", "%", "percent")).toBe(0.001);
    expect(ok("10", "ppm", "ppm")).toBe(1e-5);
    expect(ok("10 ppm", "ppm", "ppm")).toBe(1e-5);
    expect(ok("10 ppm/°C", "ppm/°C", "ppm")).toBe(1e-5);
    expect(ok("100 ppm", "%", "percent")).toBe(1e-4); // cross-unit: 100 ppm = 0.01 %
  });
});

describe("parseQuantity: IEC 60062:2016 letter-and-digit (RKM) codes", () => {
  // IEC 60062:2016 §4 (RKM code): the letter stands for the decimal point and the multiplier.
  it.each([
    ["4k7", "Ω", 4.7e3],
    ["4K7", "Ω", 4.7e3],
    ["R47", "Ω", 0.47],
    ["1M0", "Ω", 1.0e6],
    ["4R7", "Ω", 4.7],
    ["0R1", "Ω", 0.1],
    ["6M8", "Ω", 6.8e6],
    ["2n2", "F", 2.2e-9],
    ["4u7", "F", 4.7e-6],
    ["4µ7", "F", 4.7e-6],
    ["47p", "F", 47e-12],
    ["1n0", "F", 1.0e-9],
    ["p68", "F", 0.68e-12],
    ["4k7 Ω", "Ω", 4.7e3],
  ])("%s → %d %s", (text, unit, expected) => {
    expect(Math.abs(ok(text, unit) / expected - 1)).toBeLessThan(1e-12);
  });
});

describe("parseQuantity: nonsense is rejected with a message saying what was expected", () => {
  it.each([
    ["4kk7", "Ω"],
    ["-", "Ω"],
    ["1e400", "Ω"],
    ["", "Ω"],
    ["   ", "Ω"],
    ["4k7k", "Ω"],
    ["1..2", "Ω"],
    ["abc", "Ω"],
    ["10 V", "Ω"],
    ["10 mV", "Ω"],
    ["1MF", "F"], // ambiguous old marking, refused rather than read as megafarad
    ["4R7", "F"], // R marks a resistance
    ["100k", "dB"],
    ["1,5", "V"],
    ["25 m", "°C"],
    ["5 Hz", "%"],
  ])("%s in a %s field", (text, unit) => {
    const r = parseQuantity(text, { unit });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/expected|overflow|too large/);
  });

  it("overflow says so", () => {
    const r = parseQuantity("1e400", { unit: "Ω" });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/too large/);
  });

  it("a wrong unit names the field's unit", () => {
    const r = parseQuantity("10 V", { unit: "Ω" });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toContain("Ω");
  });
});

describe("formatQuantity", () => {
  // Engineering notation: mantissa in [1, 1000) with SI prefixes (SI Brochure 9th ed., Table 7);
  // negative numbers with U+2212; V/µs, nV/√Hz, pA/√Hz as the trade writes them
  // (common practice, no source).
  it.each([
    [4700, "Ω", "4.7 kΩ"],
    [2.2e-9, "F", "2.2 nF"],
    [1e6, "Hz", "1 MHz"],
    [0.1, "Ω", "100 mΩ"],
    [999.96, "Ω", "1 kΩ"], // rounding carries into the next prefix
    [-0.0123, "V", "−12.3 mV"],
    [2e7, "V/s", "20 V/µs"],
    [1e-8, "V/√Hz", "10 nV/√Hz"],
    [5e-13, "A/√Hz", "0.5 pA/√Hz"],
    [106, "dB", "106 dB"],
    [45.5, "°", "45.5°"],
    [25, "°C", "25 °C"],
    [-40, "°C", "−40 °C"],
    [1.5, "K/W", "1.5 K/W"],
    [1000, "V/V", "1000 V/V"],
    [0, "V", "0 V"],
    [1.2345678, "V", "1.235 V"],
    [2e-6, "V/°C", "2 µV/°C"],
  ])("%d %s → %s", (value, unit, text) => {
    expect(formatQuantity(value, unit)).toBe(text);
  });

  it("scales fractions to percent and ppm", () => {
    expect(formatQuantity(0.001, "%", { scale: "percent" })).toBe("0.1 %");
    expect(formatQuantity(1e-5, "ppm/°C", { scale: "ppm" })).toBe("10 ppm/°C");
    expect(formatQuantity(5e-5, "ppm", { scale: "ppm" })).toBe("50 ppm");
  });

  it("honours the digits option", () => {
    expect(formatQuantity(4.7123e3, "Ω", { digits: 2 })).toBe("4.7 kΩ");
    expect(formatQuantity(298.15, "K", { digits: 5 })).toBe("298.15 K");
  });

  it("formatNumber uses ×10ⁿ for extreme magnitudes and a real minus", () => {
    expect(formatNumber(1.380649e-23, 7)).toBe("1.380649×10⁻²³");
    expect(formatNumber(-0.012345, 3)).toBe("−0.0123");
    expect(formatNumber(12345, 4)).toBe("12350");
  });
});

describe("parse/format round trip", () => {
  const units = ["Ω", "F", "Hz", "V", "A", "W", "s", "V/s", "V/√Hz", "A/√Hz", "V/°C"];
  it("format → parse gives the value back to the printed precision", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-14, max: 1e11, noNaN: true }),
        fc.constantFrom(...units),
        fc.boolean(),
        (mag, unit, neg) => {
          const v = neg ? -mag : mag;
          const text = formatQuantity(v, unit, { digits: 6 });
          const r = parseQuantity(text, { unit });
          expect(r.ok).toBe(true);
          if (r.ok) expect(Math.abs(r.value / v - 1)).toBeLessThan(1e-5); // 6 significant figures
        },
      ),
      { numRuns: 500 },
    );
  });

  it("percent round trip", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-6, max: 1, noNaN: true }), (v) => {
        const r = parseQuantity(formatQuantity(v, "%", { scale: "percent", digits: 6 }), { unit: "%", scale: "percent" });
        expect(r.ok).toBe(true);
        if (r.ok) expect(Math.abs(r.value / v - 1)).toBeLessThan(1e-5);
      }),
    );
  });

  it("never throws on arbitrary text", () => {
    fc.assert(
      fc.property(fc.string(), fc.constantFrom(...units, "%", "°C", ""), (s, unit) => {
        const r = parseQuantity(s, { unit });
        if (r.ok) expect(Number.isFinite(r.value)).toBe(true);
        else expect(r.message.length).toBeGreaterThan(0);
      }),
      { numRuns: 1000 },
    );
  });
});
