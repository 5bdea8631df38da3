// Reading the parameters of one request the way Stripe's API does: unknown keys are refused, strings and
// integers are checked, metadata keeps to Stripe's limits (50 keys, keys ≤ 40 and values ≤ 500 characters).
import { invalidParam } from "./errors.ts";
import type { FormObject, FormValue } from "./form.ts";
import type { Metadata } from "./state.ts";

export function refuseUnknown(params: FormObject, allowed: string[], prefix = "") {
  for (const key of Object.keys(params)) {
    if (!allowed.includes(key)) {
      const name = prefix ? `${prefix}[${key}]` : key;
      throw invalidParam(name, `Received unknown parameter: ${name}`, "parameter_unknown");
    }
  }
}

export function optionalString(value: FormValue | undefined, param: string, maxLength = 5000): string | undefined {
  if (value === undefined) return undefined;
  if (typeof value !== "string") throw invalidParam(param, `Invalid string: ${param}`, "parameter_invalid_string");
  if (value.length > maxLength) throw invalidParam(param, `Invalid string: ${param} must be at most ${maxLength} characters`);
  return value;
}

export function optionalInteger(value: FormValue | undefined, param: string): number | undefined {
  if (value === undefined || value === "") return undefined;
  if (typeof value !== "string" || !/^-?\d+$/.test(value)) {
    throw invalidParam(param, `Invalid integer: ${typeof value === "string" ? value : param}`, "parameter_invalid_integer");
  }
  return Number(value);
}

export function optionalObject(value: FormValue | undefined, param: string): FormObject | undefined {
  if (value === undefined) return undefined;
  if (typeof value !== "object" || Array.isArray(value)) throw invalidParam(param, `Invalid object: ${param}`, "parameter_invalid_object");
  return value;
}

export function optionalArray(value: FormValue | undefined, param: string): FormValue[] | undefined {
  if (value === undefined) return undefined;
  if (!Array.isArray(value)) throw invalidParam(param, `Invalid array: ${param}`, "parameter_invalid_array");
  return value;
}

export function positiveInteger(value: number, param: string): number {
  if (!Number.isSafeInteger(value) || value <= 0) throw invalidParam(param, "This value must be greater than or equal to 1.", "parameter_invalid_integer");
  return value;
}

export function currency(value: string, param: string): string {
  const lower = value.toLowerCase();
  if (!/^[a-z]{3}$/.test(lower)) throw invalidParam(param, `Invalid currency: ${value}. Stripe currencies are three-letter ISO codes.`);
  return lower;
}

export function url(value: string, param: string): string {
  try {
    const parsed = new URL(value);
    if (parsed.protocol !== "http:" && parsed.protocol !== "https:") throw new Error("scheme");
  } catch {
    throw invalidParam(param, `Not a valid URL: ${param}`, "url_invalid");
  }
  return value;
}

/** Stripe's rule: an empty value removes the key. */
export function metadata(value: FormValue | undefined, param = "metadata", base: Metadata = {}): Metadata {
  if (value === undefined || value === "") return Object.assign(Object.create(null), base);
  const object = optionalObject(value, param)!;
  const out: Metadata = Object.assign(Object.create(null), base);
  for (const [key, inner] of Object.entries(object)) {
    if (typeof inner !== "string") throw invalidParam(`${param}[${key}]`, `Invalid string: ${param}[${key}]`, "parameter_invalid_string");
    if (key.length > 40) throw invalidParam(`${param}[${key}]`, `Metadata keys can have up to 40 characters; "${key}" has ${key.length}.`);
    if (inner.length > 500) throw invalidParam(`${param}[${key}]`, `Metadata values can have up to 500 characters; ${param}[${key}] has ${inner.length}.`);
    if (inner === "") delete out[key];
    else out[key] = inner;
  }
  if (Object.keys(out).length > 50) throw invalidParam(param, "Metadata can have up to 50 keys.");
  return out;
}

export function expandPaths(params: FormObject): string[] {
  const list = optionalArray(params.expand, "expand") ?? [];
  return list.map((entry, index) => optionalString(entry, `expand[${index}]`)!);
}
