import type { Submission } from "@conform-to/react";
import { data } from "react-router";
import type { Failure } from "./service.server";

type ReplyOptions<Extra> = { hideFields?: string[]; extra?: Extra };

/** A service failure as Conform's reply: at its field when it has one, else about the whole form. */
export function failureReply<T, Extra extends object = {}>(
  submission: Submission<T>,
  failure: Failure,
  options: ReplyOptions<Extra> & { asFormError?: boolean } = {},
) {
  const atField = failure.field && !options.asFormError;
  const result = submission.reply({
    formErrors: atField ? undefined : [failure.message],
    fieldErrors: atField ? { [failure.field!]: [failure.message] } : undefined,
    hideFields: options.hideFields,
  });
  const headers: HeadersInit = failure.retryAfterSeconds ? { "Retry-After": String(failure.retryAfterSeconds) } : {};
  return data({ ...(options.extra as Extra), result, errors: result.error ?? {} }, { status: failure.status, headers });
}

/** The reply for input that failed its schema. */
export function invalidReply<T, Extra extends object = {}>(submission: Submission<T>, options: ReplyOptions<Extra> = {}) {
  const result = submission.reply({ hideFields: options.hideFields });
  return data({ ...(options.extra as Extra), result, errors: result.error ?? {} }, { status: 422 });
}
