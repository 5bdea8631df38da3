// Errors in the shape Stripe's v1 API answers with: `{ error: { type, code, message, param } }` and the
// HTTP status the SDK maps to its error classes (400/404 invalid request, 401 authentication, 402 card).

export type StripeErrorType = "invalid_request_error" | "authentication_error" | "card_error" | "idempotency_error" | "api_error";

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly type: StripeErrorType,
    message: string,
    readonly code?: string,
    readonly param?: string,
    readonly extra: Record<string, unknown> = {},
  ) {
    super(message);
  }

  toJSON() {
    return { error: { type: this.type, code: this.code, message: this.message, param: this.param, ...this.extra } };
  }
}

export const missingParam = (param: string) =>
  new ApiError(400, "invalid_request_error", `Missing required param: ${param}.`, "parameter_missing", param);

export const invalidParam = (param: string, message: string, code = "parameter_invalid") =>
  new ApiError(400, "invalid_request_error", message, code, param);

export const noSuch = (kind: string, id: string, param = "id") =>
  new ApiError(404, "invalid_request_error", `No such ${kind}: '${id}'`, "resource_missing", param);
