// Stripe's v1 API takes `application/x-www-form-urlencoded` bodies whose keys nest with brackets
// (`line_items[0][price_data][currency]=eur`, `metadata[booking_id]=…`, `expand[0]=payment_intent`).
// This turns such a body (or a query string) back into the nested object the SDK started from.

export type FormValue = string | FormObject | FormValue[];
export type FormObject = { [key: string]: FormValue };

/** Splits `a[b][0][c]` into `["a", "b", "0", "c"]`; `a[]` gives `["a", ""]` (append). */
function keyPath(key: string): string[] {
  const first = key.indexOf("[");
  if (first === -1) return [key];
  const path = [key.slice(0, first)];
  for (const match of key.slice(first).matchAll(/\[([^\]]*)\]/g)) path.push(match[1] ?? "");
  return path;
}

function isIndexObject(value: FormObject): boolean {
  const keys = Object.keys(value);
  return keys.length > 0 && keys.every((key) => /^\d+$/.test(key));
}

/** Objects whose keys are all indices become arrays, in index order (Stripe's own reading of `qs` indices). */
function toArrays(value: FormValue): FormValue {
  if (typeof value === "string") return value;
  if (Array.isArray(value)) return value.map(toArrays);
  if (isIndexObject(value)) {
    return Object.keys(value)
      .sort((a, b) => Number(a) - Number(b))
      .map((key) => toArrays(value[key]!));
  }
  const out: FormObject = Object.create(null);
  for (const [key, inner] of Object.entries(value)) out[key] = toArrays(inner);
  return out;
}

// Objects without a prototype, so that keys such as `__proto__` are plain keys here.
export function parseStripeForm(encoded: string): FormObject {
  const root: FormObject = Object.create(null);
  for (const [rawKey, value] of new URLSearchParams(encoded)) {
    const path = keyPath(rawKey);
    let node: FormObject = root;
    for (let i = 0; i < path.length; i++) {
      let segment = path[i]!;
      const last = i === path.length - 1;
      // `a[]=x` appends: give it the next free index.
      if (segment === "") segment = String(Object.keys(node).length);
      if (last) {
        node[segment] = value;
      } else {
        const next = node[segment];
        if (typeof next !== "object" || next === null || Array.isArray(next)) node[segment] = Object.create(null);
        node = node[segment] as FormObject;
      }
    }
  }
  return toArrays(root) as FormObject;
}
