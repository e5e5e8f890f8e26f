/**
 * Verification codes printed on every report page, e.g. "LW-7K3Q-9XPA".
 *
 * 8 characters of Crockford's base32 (digits and capitals without I, L, O, U) from 40 random
 * bits, in two groups of four after the "LW-" prefix. Users type codes from paper, so the
 * normaliser accepts lower case, missing or extra dashes and spaces, and the usual look-alike
 * confusions (O for 0, I or L for 1).
 */
import { randomBytes } from "node:crypto";

/** Crockford's base32 alphabet (32 symbols, no I L O U). */
export const CODE_ALPHABET = "0123456789ABCDEFGHJKMNPQRSTVWXYZ";
/** Printed prefix of every code. */
export const CODE_PREFIX = "LW";
/** Number of random symbols in a code (5 bits each: 40 bits). */
export const CODE_LENGTH = 8;

/** Canonical form: "LW-" + 4 symbols + "-" + 4 symbols. */
export const CODE_PATTERN = /^LW-[0-9ABCDEFGHJKMNPQRSTVWXYZ]{4}-[0-9ABCDEFGHJKMNPQRSTVWXYZ]{4}$/;

/**
 * A new random verification code in canonical form.
 *
 * @param random source of random bytes (defaults to node:crypto randomBytes); tests may inject one.
 * @returns e.g. "LW-7K3Q-9XPA" (40 bits of entropy).
 */
export function generateVerificationCode(random: (size: number) => Buffer = randomBytes): string {
  const bytes = random(5);
  if (bytes.length < 5) throw new Error("random source returned fewer than 5 bytes");
  // 40 bits → 8 symbols of 5 bits, most significant first.
  let bits = 0n;
  for (let i = 0; i < 5; i++) bits = (bits << 8n) | BigInt(bytes[i]);
  let symbols = "";
  for (let i = CODE_LENGTH - 1; i >= 0; i--) symbols += CODE_ALPHABET[Number((bits >> BigInt(5 * i)) & 31n)];
  return `${CODE_PREFIX}-${symbols.slice(0, 4)}-${symbols.slice(4)}`;
}

/** Look-alike characters users type, mapped to the symbol they meant (Crockford's rules). */
const LOOK_ALIKES: Record<string, string> = { O: "0", I: "1", L: "1" };

/**
 * Normalises what a user typed into the canonical code, or returns null if it cannot be one.
 *
 * Accepts: any case; dashes, spaces, dots and underscores anywhere; with or without the "LW"
 * prefix (also typed "1W" or "IW"); O for 0 and I or L for 1 in the symbols.
 *
 * @example normaliseVerificationCode(" lw 7k3q9xpa ") === "LW-7K3Q-9XPA"
 * @example normaliseVerificationCode("LW-7K3Q-9XPO") === "LW-7K3Q-9XP0"
 */
export function normaliseVerificationCode(input: string): string | null {
  if (typeof input !== "string") return null;
  let s = input.toUpperCase().replace(/[\s\-_.\u2010-\u2015\u2212]/g, "");
  if (s.length === CODE_LENGTH + 2 && /^[LI1]W/.test(s)) s = s.slice(2);
  if (s.length !== CODE_LENGTH) return null;
  let symbols = "";
  for (const ch of s) {
    const c = LOOK_ALIKES[ch] ?? ch;
    if (!CODE_ALPHABET.includes(c)) return null;
    symbols += c;
  }
  return `${CODE_PREFIX}-${symbols.slice(0, 4)}-${symbols.slice(4)}`;
}

/** True when `code` is already in canonical form ("LW-XXXX-XXXX", Crockford symbols). */
export function isCanonicalVerificationCode(code: string): boolean {
  return CODE_PATTERN.test(code);
}

/**
 * The address printed (and encoded in the QR code) on a report.
 *
 * @param origin the public origin of the app, e.g. "https://app.loopwright.example".
 * @param code a canonical verification code.
 * @returns e.g. "https://app.loopwright.example/verify?code=LW-7K3Q-9XPA".
 */
export function verifyUrlFor(origin: string, code: string): string {
  return `${origin.replace(/\/+$/, "")}/verify?code=${encodeURIComponent(code)}`;
}
