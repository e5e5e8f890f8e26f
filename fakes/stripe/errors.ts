/** Stripe-shaped API errors: `{ error: { type, message, param, code } }` with an HTTP status. */

/** The error `type` values Stripe's v1 API uses that the fake can produce. */
export type StripeErrorType = "invalid_request_error" | "idempotency_error" | "api_error" | "card_error";

/** An error the fake answers with; the SDK turns it into the matching Stripe*Error class. */
export class StripeApiError extends Error {
  constructor(
    readonly status: number,
    readonly type: StripeErrorType,
    message: string,
    readonly param?: string,
    readonly code?: string,
  ) {
    super(message);
  }

  /** The JSON body Stripe sends for this error. */
  toBody(requestId: string): { error: Record<string, string> } {
    const error: Record<string, string> = { type: this.type, message: this.message };
    if (this.param) error.param = this.param;
    if (this.code) error.code = this.code;
    if (this.code) error.doc_url = `https://docs.stripe.com/error-codes/${this.code.replace(/_/g, "-")}`;
    error.request_log_url = `https://dashboard.stripe.com/test/logs/${requestId}`;
    return { error };
  }
}

/** 400 `parameter_missing`. */
export function missingParam(param: string): StripeApiError {
  return new StripeApiError(400, "invalid_request_error", `Missing required param: ${param}.`, param, "parameter_missing");
}

/** 400 for a bad value of `param`. */
export function invalidParam(param: string, message: string, code = "parameter_invalid"): StripeApiError {
  return new StripeApiError(400, "invalid_request_error", message, param, code);
}

/** `resource_missing` for an unknown id: 404 when the id is in the URL, 400 when it is a param. */
export function noSuch(kind: string, id: string, param = "id", status = param === "id" ? 404 : 400): StripeApiError {
  return new StripeApiError(status, "invalid_request_error", `No such ${kind}: '${id}'`, param, "resource_missing");
}
