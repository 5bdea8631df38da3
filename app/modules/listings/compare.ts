/** How many machines one comparison shows: four columns still fit a laptop's width. */
export const MAX_COMPARED = 4;

// Which of the compared machines has the better figure. Pure: the compare page and its tests share it.

/**
 * The positions holding the smallest deviation (by size: a figure's sign says which way, not how far), when
 * at least two machines have the figure and they differ; ties for the smallest are all best. Lower is better for every deviation compared.
 */
export function bestDeviations(values: ReadonlyArray<number | null | undefined>): Set<number> {
  const known = values.flatMap((value, index) => (value === null || value === undefined || !Number.isFinite(value) ? [] : [{ index, size: Math.abs(value) }]));
  if (known.length < 2) return new Set();
  const smallest = Math.min(...known.map((entry) => entry.size));
  // When every machine reads the same, none is better: nothing is marked.
  if (known.every((entry) => entry.size - smallest < 0.0005)) return new Set();
  // Figures are stored to a thousandth of a micrometre; closer than that is the same reading.
  return new Set(known.filter((entry) => entry.size - smallest < 0.0005).map((entry) => entry.index));
}
