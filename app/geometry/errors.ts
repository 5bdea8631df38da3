/**
 * Thrown for input the engine cannot score: too few readings, non-finite numbers, a station read
 * twice, a length that is not positive. The message says what to fix; `path` points at the field
 * (relative to the value the caller passed) when the engine knows it.
 */
export class GeometryInputError extends Error {
  readonly path: readonly (string | number)[];

  constructor(message: string, path: readonly (string | number)[] = []) {
    super(message);
    this.name = "GeometryInputError";
    this.path = path;
  }

  /** The same error, located inside a larger input (e.g. under `tests.L-BED-V`). */
  within(...prefix: (string | number)[]): GeometryInputError {
    return new GeometryInputError(this.message, [...prefix, ...this.path]);
  }
}

export function requireFinite(value: number, what: string, path: readonly (string | number)[] = []): number {
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw new GeometryInputError(`${what} must be a finite number, got ${String(value)}.`, path);
  }
  return value;
}

export function requirePositive(value: number, what: string, path: readonly (string | number)[] = []): number {
  requireFinite(value, what, path);
  if (value <= 0) {
    throw new GeometryInputError(`${what} must be greater than 0, got ${value}.`, path);
  }
  return value;
}

export function requireAtLeast<T>(
  list: readonly T[],
  count: number,
  what: string,
  path: readonly (string | number)[] = [],
): readonly T[] {
  if (!Array.isArray(list)) {
    throw new GeometryInputError(`${what} must be a list.`, path);
  }
  if (list.length < count) {
    const got = list.length === 0 ? "none" : `only ${list.length}`;
    throw new GeometryInputError(`${what} needs at least ${count} values; got ${got}.`, path);
  }
  return list;
}
