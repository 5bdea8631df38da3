// A seeded generator, so that every bench run seeds the same invented machines, places and readings.

/** mulberry32: a small, fast 32-bit generator; plenty for demo data (not for anything secret). */
export function seededRandom(seed: number) {
  let state = seed >>> 0;
  const next = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296;
  };
  return {
    next,
    /** A whole number in [min, max]. */
    int: (min: number, max: number) => min + Math.floor(next() * (max - min + 1)),
    /** A number in [min, max). */
    between: (min: number, max: number) => min + next() * (max - min),
    pick: <T>(items: readonly T[]): T => items[Math.floor(next() * items.length)]!,
    chance: (probability: number) => next() < probability,
    /** A version-4-shaped UUID drawn from this generator (repeatable ids across runs). */
    uuid: () => {
      const hex = Array.from({ length: 32 }, () => Math.floor(next() * 16).toString(16));
      hex[12] = "4";
      hex[16] = ((Number.parseInt(hex[16]!, 16) & 0x3) | 0x8).toString(16);
      const text = hex.join("");
      return `${text.slice(0, 8)}-${text.slice(8, 12)}-${text.slice(12, 16)}-${text.slice(16, 20)}-${text.slice(20)}`;
    },
  };
}

export type SeededRandom = ReturnType<typeof seededRandom>;

/** Picks by weight: `[["a", 3], ["b", 1]]` gives "a" three times as often. */
export function weighted<T>(random: SeededRandom, choices: readonly (readonly [T, number])[]): T {
  const total = choices.reduce((sum, [, weight]) => sum + weight, 0);
  let roll = random.next() * total;
  for (const [value, weight] of choices) {
    roll -= weight;
    if (roll < 0) return value;
  }
  return choices.at(-1)![0];
}
