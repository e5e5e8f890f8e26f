/**
 * One error class with a closed set of codes, and one mapping from codes (and zod errors) to HTTP
 * statuses. Every API error has the shape { error: { code, message, fields } }.
 */
import { z } from "zod";

export const ERROR_STATUS = {
  bad_request: 400,
  unauthenticated: 401,
  pack_locked: 402,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  payload_too_large: 413,
  unsupported_media_type: 415,
  invalid_input: 422,
  rate_limited: 429,
  read_only: 403,
  seat_limit: 409,
  unavailable: 503,
  internal: 500,
} as const;

export type ErrorCode = keyof typeof ERROR_STATUS;

/** Field name → message, e.g. { email: "must be a valid e-mail address" }. */
export type FieldMessages = Record<string, string>;

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly fields?: FieldMessages;
  readonly headers?: Record<string, string>;
  constructor(code: ErrorCode, message: string, opts?: { fields?: FieldMessages; headers?: Record<string, string> }) {
    super(message);
    this.name = "AppError";
    this.code = code;
    this.fields = opts?.fields;
    this.headers = opts?.headers;
  }
  get status(): number {
    return ERROR_STATUS[this.code];
  }
}

/** Shorthands for the common cases. */
export const notFound = (what = "That item") => new AppError("not_found", `${what} was not found.`);
export const forbidden = (message = "Your role in this workspace does not allow that.") => new AppError("forbidden", message);
export const unauthenticated = () => new AppError("unauthenticated", "Sign in to continue.");

/** zod issues → { field: message }, field as a dotted path ("opamp.gbw"). First message per field. */
export function zodFields(error: z.ZodError): FieldMessages {
  const fields: FieldMessages = {};
  for (const issue of error.issues) {
    const key = issue.path.map(String).join(".") || "body";
    if (!(key in fields)) fields[key] = issue.message;
  }
  return fields;
}

/** A ZodError as an AppError (422) whose message names the fields and rules. */
export function fromZod(error: z.ZodError): AppError {
  const fields = zodFields(error);
  const summary = Object.entries(fields)
    .slice(0, 3)
    .map(([k, m]) => `${k}: ${m}`)
    .join("; ");
  return new AppError("invalid_input", `Please correct the highlighted fields (${summary}).`, { fields });
}

export interface ErrorBody {
  error: { code: ErrorCode; message: string; fields?: FieldMessages };
}

/** Any thrown value → { status, body }. Unknown errors are logged and become a generic 500. */
export function toErrorBody(err: unknown): { status: number; body: ErrorBody; headers?: Record<string, string> } {
  if (err instanceof AppError) {
    return { status: err.status, body: { error: { code: err.code, message: err.message, fields: err.fields } }, headers: err.headers };
  }
  if (err instanceof z.ZodError) {
    const e = fromZod(err);
    return { status: e.status, body: { error: { code: e.code, message: e.message, fields: e.fields } } };
  }
  console.error("[loopwright] unexpected error", err);
  return { status: 500, body: { error: { code: "internal", message: "Something went wrong on our side. Nothing was changed; please try again." } } };
}
