/** Random ids and tokens. */
import crypto from "node:crypto";

/** A new row id. */
export function newId(): string {
  return crypto.randomUUID();
}

/** A URL-safe random token of `bytes` random bytes (default 32 = 256 bits). */
export function newToken(bytes = 32): string {
  return crypto.randomBytes(bytes).toString("base64url");
}

/** SHA-256 hex of a string or buffer (tokens are stored only as their hash). */
export function sha256Hex(data: string | Buffer | Uint8Array): string {
  return crypto.createHash("sha256").update(data).digest("hex");
}
