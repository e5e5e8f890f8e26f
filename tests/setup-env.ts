// Loaded before every vitest file: a complete test environment with its own SQLite file per file.
import os from "node:os";
import path from "node:path";
import crypto from "node:crypto";

const id = `${process.pid}-${crypto.randomBytes(4).toString("hex")}`;
process.env.DATABASE_URL = `file:${path.join(os.tmpdir(), `loopwright-test-${id}.db`)}`;
process.env.NEXTAUTH_URL = "http://localhost:3999";
process.env.NEXTAUTH_SECRET = "test-secret-test-secret-test-secret-0123";
process.env.REPORT_KEY_SECRET = "test-report-key-secret-0123456789abcdef";
process.env.STRIPE_SECRET_KEY = process.env.STRIPE_SECRET_KEY ?? "sk_test_unit";
process.env.STRIPE_WEBHOOK_SECRET = process.env.STRIPE_WEBHOOK_SECRET ?? "whsec_unit_test_secret";
process.env.MAIL_TRANSPORT = "json";
