// Errors in the hosted engine's shape, `{ message, code, type, link }`, with the HTTP status to answer.
export type ErrorType = "invalid_request" | "internal" | "auth" | "system";

export type ApiErrorBody = { message: string; code: string; type: ErrorType; link: string };

export class ApiError extends Error {
  override name = "ApiError";
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly type: ErrorType = "invalid_request",
  ) {
    super(message);
  }

  toJSON(): ApiErrorBody {
    return { message: this.message, code: this.code, type: this.type, link: `https://docs.meilisearch.com/errors#${this.code}` };
  }
}

export const indexNotFound = (uid: string) => new ApiError(404, "index_not_found", `Index \`${uid}\` not found.`);
export const badRequest = (message: string) => new ApiError(400, "bad_request", message);
