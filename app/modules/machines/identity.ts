// Identifying one machine across listings and owners by make, model and serial number. Pure.
// Serials are typed from worn plates, so the comparison forgives what is usually mistyped: case, spaces and
// punctuation, O for 0 and I or L for 1 (common practice of reading stamped plates), and one character wrong.

/** Make or model as a key: lower case, letters and digits only. */
export function nameKey(value: string): string {
  return value.normalize("NFKC").toLowerCase().replace(/[^\p{L}\p{N}]+/gu, "");
}

/** A serial as a key: upper case, letters and digits only, O read as 0 and I or L as 1. Empty when there is none. */
export function serialKey(value: string | null | undefined): string {
  if (!value) return "";
  return value
    .normalize("NFKC")
    .toUpperCase()
    .replace(/[^\p{L}\p{N}]+/gu, "")
    .replace(/O/g, "0")
    .replace(/[IL]/g, "1");
}

/** Levenshtein distance, stopping early once it exceeds `limit` (serials are short). */
export function editDistance(a: string, b: string, limit = 2): number {
  if (Math.abs(a.length - b.length) > limit) return limit + 1;
  let previous = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i += 1) {
    const current = [i];
    let best = i;
    for (let j = 1; j <= b.length; j += 1) {
      const value = Math.min(previous[j]! + 1, current[j - 1]! + 1, previous[j - 1]! + (a[i - 1] === b[j - 1] ? 0 : 1));
      current.push(value);
      best = Math.min(best, value);
    }
    if (best > limit) return limit + 1;
    previous = current;
  }
  return previous[b.length]!;
}

export interface MachineIdentity {
  make: string;
  model: string;
  serialNumber: string | null;
}

/** "same" when the keys agree, "close" when the serials differ by one character, otherwise null. Never without a serial. */
export function matchOf(a: MachineIdentity, b: MachineIdentity): "same" | "close" | null {
  const serialA = serialKey(a.serialNumber);
  const serialB = serialKey(b.serialNumber);
  if (serialA.length < 3 || serialB.length < 3) return null;
  if (nameKey(a.make) !== nameKey(b.make) || nameKey(a.model) !== nameKey(b.model)) return null;
  if (serialA === serialB) return "same";
  return editDistance(serialA, serialB, 1) <= 1 ? "close" : null;
}
