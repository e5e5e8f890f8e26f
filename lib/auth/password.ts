/** Password hashing with bcrypt (bcryptjs, cost 10: ~70 ms on this machine). */
import bcrypt from "bcryptjs";

const COST = 10;

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, COST);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

let dummy: string | undefined;
/** A hash to compare against when the e-mail is unknown, so both cases take the same time. */
export function dummyHash(): string {
  dummy ??= bcrypt.hashSync("not-a-password-of-anyone", COST);
  return dummy;
}
