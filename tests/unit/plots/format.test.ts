// Tick and read-out text. Prefixes come from lib/calc/core/units.ts (formatQuantity); the SI
// prefixes themselves (k = 10³, M = 10⁶, µ = 10⁻⁶, m = 10⁻³) are from the SI Brochure, 9th ed.,
// Table 7. Negative numbers use the real minus sign U+2212.
import { describe, expect, it } from "vitest";
import { axisTitle, keepUnits, linearTickFormat, logTickLabel, readoutOnAxis, sharedFormat } from "@/app/_components/plots/format";

describe("linearTickFormat", () => {
  it("shares one prefix across an axis and gives every tick the same decimals", () => {
    const f = linearTickFormat([0, 5e-7, 1e-6, 1.5e-6], 5e-7, "s");
    expect(f.unitText).toBe("µs");
    expect(f.factor).toBe(1e-6);
    expect([0, 5e-7, 1e-6, 1.5e-6].map(f.format)).toEqual(["0.0", "0.5", "1.0", "1.5"]);
  });
  it("writes kHz ticks for a frequency axis around 20 kHz", () => {
    const f = linearTickFormat([19000, 19500, 20000, 20500], 500, "Hz");
    expect(f.unitText).toBe("kHz");
    expect(f.format(19500)).toBe("19.5");
    expect(f.format(20000)).toBe("20.0");
  });
  it("keeps dB and degrees without prefix, with the real minus sign", () => {
    const db = linearTickFormat([-160, -120, 0, 40], 40, "dB");
    expect(db.unitText).toBe("dB");
    expect(db.format(-160)).toBe("\u2212160");
    expect(db.format(40)).toBe("40");
    const deg = linearTickFormat([-270, -180, -90, 0], 90, "°");
    expect(deg.unitText).toBe("°");
    expect(deg.format(-90)).toBe("\u221290");
  });
  it("writes zero without a sign", () => {
    expect(linearTickFormat([-1, 0, 1], 0.5, "V").format(-1e-17)).toBe("0.0");
  });
  it("leaves plain numbers alone", () => {
    const f = linearTickFormat([0, 100, 200], 100, "");
    expect(f.unitText).toBe("");
    expect(f.format(200)).toBe("200");
  });
});

describe("logTickLabel", () => {
  it("labels decades with their own prefix", () => {
    expect([10, 100, 1e3, 1e4, 1e5, 1e6, 1e7].map((v) => logTickLabel(v, "Hz"))).toEqual(["10 Hz", "100 Hz", "1 kHz", "10 kHz", "100 kHz", "1 MHz", "10 MHz"]);
    expect(logTickLabel(2e-3, "A")).toBe("2 mA");
  });
});

describe("read-outs", () => {
  it("reads values closer to zero than 10⁻⁵ of the axis span as zero", () => {
    expect(readoutOnAxis(-2.3e-12, "dB", 127)).toBe("0 dB");
    expect(readoutOnAxis(-3.0103, "dB", 127)).toBe("\u22123.01 dB");
    expect(readoutOnAxis(-0.06933, "°", 270)).toBe("\u22120.06933°");
    expect(readoutOnAxis(NaN, "dB", 127)).toBe("—");
  });
  it("formats a column of levels with one prefix and aligned decimals", () => {
    const f = sharedFormat([5, 4.9, 0.1, 0], "V");
    expect([5, 4.9, 0.1, 0].map(f)).toEqual(["5.00 V", "4.90 V", "0.10 V", "0.00 V"]);
    expect(sharedFormat([0.5, 0.12], "V")(0.12)).toBe("120 mV");
    expect(sharedFormat([15, -15], "V")(-14.2)).toBe("\u221214.2 V");
  });
  it("puts units in axis titles and keeps numbers with their units", () => {
    expect(axisTitle("Gain", "dB")).toBe("Gain (dB)");
    expect(axisTitle("Count", "")).toBe("Count");
    expect(keepUnits("with 400 mV to spare")).toBe("with 400\u00a0mV to spare");
  });
});
