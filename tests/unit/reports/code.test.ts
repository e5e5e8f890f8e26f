import { describe, expect, it } from "vitest";
import {
  CODE_ALPHABET,
  CODE_PATTERN,
  generateVerificationCode,
  isCanonicalVerificationCode,
  normaliseVerificationCode,
  verifyUrlFor,
} from "@/lib/reports/code";

describe("verification codes", () => {
  it("uses Crockford's base32 alphabet", () => {
    // Crockford, "Base 32" (crockford.com/base32.html): digits and letters without I, L, O, U.
    expect(CODE_ALPHABET).toBe("0123456789ABCDEFGHJKMNPQRSTVWXYZ");
    expect(new Set(CODE_ALPHABET).size).toBe(32);
  });

  it("encodes 40 random bits as 8 symbols, most significant first", () => {
    const bytes = (b: number[]) => () => Buffer.from(b);
    expect(generateVerificationCode(bytes([0, 0, 0, 0, 0]))).toBe("LW-0000-0000");
    expect(generateVerificationCode(bytes([0xff, 0xff, 0xff, 0xff, 0xff]))).toBe("LW-ZZZZ-ZZZZ");
    // 0x0842108421 = 00001 repeated eight times: every symbol is "1".
    expect(generateVerificationCode(bytes([0x08, 0x42, 0x10, 0x84, 0x21]))).toBe("LW-1111-1111");
    // 0x0000000001 → only the last symbol is 1; 0x8000000000 → first symbol 10000b = 16 = "G".
    expect(generateVerificationCode(bytes([0, 0, 0, 0, 1]))).toBe("LW-0000-0001");
    expect(generateVerificationCode(bytes([0x80, 0, 0, 0, 0]))).toBe("LW-G000-0000");
  });

  it("makes canonical, distinct codes from crypto random", () => {
    const codes = Array.from({ length: 2000 }, () => generateVerificationCode());
    for (const c of codes) expect(c).toMatch(CODE_PATTERN);
    // 2000 draws from 2^40: a collision has probability about 2e-6.
    expect(new Set(codes).size).toBe(codes.length);
  });

  it("refuses a random source that returns too few bytes", () => {
    expect(() => generateVerificationCode(() => Buffer.alloc(4))).toThrow(/fewer than 5 bytes/);
  });

  it("normalises what people type", () => {
    expect(normaliseVerificationCode("LW-7K3Q-9XPA")).toBe("LW-7K3Q-9XPA");
    expect(normaliseVerificationCode("lw-7k3q-9xpa")).toBe("LW-7K3Q-9XPA");
    expect(normaliseVerificationCode(" lw 7k3q9xpa ")).toBe("LW-7K3Q-9XPA");
    expect(normaliseVerificationCode("LW7K3Q9XPA")).toBe("LW-7K3Q-9XPA");
    expect(normaliseVerificationCode("7K3Q-9XPA")).toBe("LW-7K3Q-9XPA");
    expect(normaliseVerificationCode("7k3q 9xpa")).toBe("LW-7K3Q-9XPA");
    expect(normaliseVerificationCode("LW–7K3Q–9XPA")).toBe("LW-7K3Q-9XPA"); // en dashes from a word processor
    // Look-alikes (Crockford's decoding rules): O → 0, I and L → 1.
    expect(normaliseVerificationCode("LW-OOOO-IIII")).toBe("LW-0000-1111");
    expect(normaliseVerificationCode("lw-1l1l-oo0o")).toBe("LW-1111-0000");
    // The prefix itself typed with a look-alike.
    expect(normaliseVerificationCode("1W-7K3Q-9XPA")).toBe("LW-7K3Q-9XPA");
  });

  it("rejects what cannot be a code", () => {
    expect(normaliseVerificationCode("")).toBeNull();
    expect(normaliseVerificationCode("LW-7K3Q-9XP")).toBeNull(); // 7 symbols
    expect(normaliseVerificationCode("LW-7K3Q-9XPAB")).toBeNull(); // 9 symbols
    expect(normaliseVerificationCode("LW-7K3Q-9XPU")).toBeNull(); // U is not a symbol
    expect(normaliseVerificationCode("LW-7K3Q-9X#A")).toBeNull();
    expect(normaliseVerificationCode("XX-7K3Q-9XPA")).toBeNull(); // wrong prefix: 10 symbols
  });

  it("tells canonical codes apart", () => {
    expect(isCanonicalVerificationCode("LW-7K3Q-9XPA")).toBe(true);
    expect(isCanonicalVerificationCode("lw-7k3q-9xpa")).toBe(false);
    expect(isCanonicalVerificationCode("LW-7K3Q-9XPO")).toBe(false);
  });

  it("builds the verify address", () => {
    expect(verifyUrlFor("https://app.example/", "LW-7K3Q-9XPA")).toBe("https://app.example/verify?code=LW-7K3Q-9XPA");
    expect(verifyUrlFor("https://app.example", "LW-7K3Q-9XPA")).toBe("https://app.example/verify?code=LW-7K3Q-9XPA");
  });
});
