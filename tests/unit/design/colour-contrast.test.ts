// The colour tokens of app/app.css, checked once against WCAG 2.2 AA so that every component built from
// them inherits passing pairs: 4.5:1 for text (success criterion 1.4.3), 3:1 for control borders, focus
// rings and the marks that carry a state (1.4.11). Contrast ratios by the `color` package, which follows
// WCAG's definition of relative luminance. The pages themselves are checked by axe-core in tests/e2e.
import Color from "color";
import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

const root = path.resolve(import.meta.dirname, "../../..");
const css = readFileSync(path.join(root, "app/app.css"), "utf8");
const tokens = new Map<string, string>([["white", "#ffffff"]]);
for (const [, name, value] of css.matchAll(/--color-([a-z0-9-]+):\s*(#[0-9a-f]{6})\b/gi)) tokens.set(name!, value!);

function colour(name: string) {
  const value = tokens.get(name);
  if (!value) throw new Error(`no colour token --color-${name} in app/app.css`);
  return Color(value);
}
const ratio = (foreground: string, background: string) => colour(foreground).contrast(colour(background));

/** Every light ground a page puts text or controls on: cards, the page, panels and table stripes, chips. */
const SURFACES = ["white", "paper", "ink-50", "ink-100"];
/** Colours allowed for text on those surfaces. */
const TEXT = ["ink-400", "ink-500", "ink-600", "ink-700", "ink-800", "ink-900", "ink-950", "brass-600", "brass-700", "within", "beyond", "caution"];
/** Fills that carry white text: primary buttons, the current page, grade A, solid verdicts. */
const DARK_FILLS = ["ink-700", "ink-800", "ink-900", "ink-950", "within", "beyond", "caution"];
/** Badges and notices: their text on their own tint (the neutral badge is ink-700 on ink-100, above). */
const TINTED = [
  ["within", "within-soft"],
  ["beyond", "beyond-soft"],
  ["caution", "caution-soft"],
  ["brass-700", "brass-100"],
  ["ink-800", "caution-soft"],
  ["ink-800", "beyond-soft"],
] as const;
/** Non-text colours that must be seen against the surfaces: control borders, focus rings, selected marks. */
const NON_TEXT = ["ink-300", "ink-400", "brass-400", "brass-500", "within", "beyond", "caution"];

describe("the contrast function", () => {
  it("gives WCAG's figures for known pairs", () => {
    // WCAG 2.2, definition of contrast ratio: black on white is 21:1, a colour on itself 1:1.
    expect(Color("#000000").contrast(Color("#ffffff"))).toBeCloseTo(21, 5);
    expect(Color("#17212b").contrast(Color("#17212b"))).toBeCloseTo(1, 5);
    // The grey often quoted as the lightest passing 4.5:1 on white (#767676 gives 4.54:1, common practice).
    expect(Color("#767676").contrast(Color("#ffffff"))).toBeCloseTo(4.54, 2);
    // The failure axe-core reported on our old muted grey: #667887 on #f5f6f7 is 4.21:1.
    expect(Color("#667887").contrast(Color("#f5f6f7"))).toBeCloseTo(4.21, 1);
  });
});

describe("the colour tokens", () => {
  it.each(TEXT.flatMap((text) => SURFACES.map((surface) => [text, surface])))("%s text on %s keeps 4.5:1", (text, surface) => {
    expect(ratio(text!, surface!)).toBeGreaterThanOrEqual(4.5);
  });

  it.each(DARK_FILLS)("white text on %s keeps 4.5:1", (fill) => {
    expect(ratio("white", fill)).toBeGreaterThanOrEqual(4.5);
  });

  it.each(TINTED)("%s text on %s keeps 4.5:1", (text, tint) => {
    expect(ratio(text, tint)).toBeGreaterThanOrEqual(4.5);
  });

  it("the “Verified” and “Within” badges keep a full point above 4.5:1, so that a rendering or a tint change cannot push them under", () => {
    expect(ratio("within", "within-soft")).toBeGreaterThanOrEqual(5.5);
    for (const surface of SURFACES) expect(ratio("within", surface)).toBeGreaterThanOrEqual(5.5);
  });

  it.each(NON_TEXT.flatMap((mark) => SURFACES.map((surface) => [mark, surface])))("%s as a border, ring or mark on %s keeps 3:1", (mark, surface) => {
    expect(ratio(mark!, surface!)).toBeGreaterThanOrEqual(3);
  });

  it("the focus ring keeps 3:1 on the dark fills too, where a focused primary button sits", () => {
    for (const fill of ["ink-900", "ink-950"]) expect(ratio("brass-400", fill)).toBeGreaterThanOrEqual(3);
  });
});

/** Every .tsx under app/, for the classes the components actually use. */
function sources(folder = path.join(root, "app")): string[] {
  return readdirSync(folder).flatMap((name) => {
    const full = path.join(folder, name);
    if (statSync(full).isDirectory()) return sources(full);
    return name.endsWith(".tsx") ? [full] : [];
  });
}

describe("the components", () => {
  const used = (pattern: RegExp) => {
    const found = new Map<string, string>();
    for (const file of sources()) for (const match of readFileSync(file, "utf8").matchAll(pattern)) found.set(match[1]!, path.relative(root, file));
    return found;
  };

  it("colour text only with a token checked above (or white, on a dark fill)", () => {
    const allowed = new Set([...TEXT, "white"]);
    const found = used(/(?<![\w-])(?:[a-z-]+:)*text-((?:ink|brass)-\d+|within|beyond|caution|paper|white|[a-z]+-soft)\b/g);
    expect(found.has("ink-900"), "the scan finds the classes").toBe(true);
    const wrong = [...found].filter(([token]) => !allowed.has(token));
    expect(wrong, "text coloured with a surface or hairline token").toEqual([]);
  });

  it("draw focus rings only in a colour that keeps 3:1", () => {
    const allowed = new Set(["brass-400", "brass-500", "ink-900"]);
    const wrong = [...used(/(?<![\w-])focus(?:-visible)?:(?:ring|outline)-((?:ink|brass)-\d+|within|beyond|caution)\b/g)].filter(([token]) => !allowed.has(token));
    expect(wrong).toEqual([]);
  });
});
