// The four corrections of the planner, each a card: fields in the reader's units, the engine's answer in words,
// the formula with the figures put in, and a sketch. Everything is computed in the browser by the engine.
import { useState } from "react";
import { backOffAngleFor, endFloatCheck, nutAxialMovement, scrapingDepths, tailstockSetOver, tiltCorrection, SCRAPING_LIMITS } from "~/geometry";
import type { DisplayUnits } from "~/modules/units/format";
import { formatDecimal } from "~/modules/units/format";
import { Caution, Fields, PlannerCard, ResultBlock, attempt, useFields, type FieldSpec } from "./calculator";
import { NutSketch, ScrapingSketch, SetOverSketch, TiltSketch } from "./sketches";
import { MM_PER_INCH, formatSmall, lengthLabel, lengthNumber, lengthToMm, parseTyped, smallLabel, smallNumber, smallToUm } from "./units";

const first = (path: readonly (string | number)[]) => String(path[0] ?? "");

function PlaneChoice({ plane, setPlane }: { plane: "vertical" | "horizontal"; setPlane: (plane: "vertical" | "horizontal") => void }) {
  return (
    <fieldset className="flex flex-wrap gap-3">
      <legend className="mb-1.5 text-sm font-semibold text-ink-800">Plane of the mandrel reading</legend>
      {(["vertical", "horizontal"] as const).map((value) => (
        <label key={value} className="flex min-h-11 cursor-pointer items-center gap-2 rounded-control border border-ink-300 px-4 py-2 has-[:checked]:border-brass-500 has-[:checked]:bg-brass-100">
          <input type="radio" name="plane" value={value} checked={plane === value} onChange={() => setPlane(value)} />
          {value === "vertical" ? "Vertical (shim)" : "Horizontal (move sideways)"}
        </label>
      ))}
    </fieldset>
  );
}

export function TiltCard({ units }: { units: DisplayUnits }) {
  const [plane, setPlane] = useState<"vertical" | "horizontal">("vertical");
  const [part, setPart] = useState<"headstock" | "tailstock">("headstock");
  const u = lengthLabel(units);
  const s = smallLabel(units);
  const specs: FieldSpec[] = [
    { name: "inclination", label: `Inclination over the measuring length (${s})`, hint: plane === "vertical" ? "+ = free end higher" : "+ = free end toward the tool (front)", initial: "" },
    { name: "measuringLength", label: `Measuring length (${u})`, hint: "Between the near and the far reading", initial: units === "inch" ? "12" : "300" },
    { name: "padDistance", label: `Distance between the seating pads (${u})`, hint: "Along the spindle axis", initial: "" },
  ];
  const { values, numbers, set } = useFields(specs);
  const outcome = attempt(numbers, first, () => {
    const input = {
      plane,
      inclination: smallToUm(numbers.inclination!, units),
      measuringLength: lengthToMm(numbers.measuringLength!, units),
      padDistance: lengthToMm(numbers.padDistance!, units),
    };
    return { input, correction: tiltCorrection(input) };
  });
  const errors = "errors" in outcome ? outcome.errors : {};
  let answer = "";
  let sketchLabel = "";
  if ("result" in outcome) {
    const { correction } = outcome.result;
    const amount = formatSmall(correction.amount, units);
    if (!correction.pad) answer = "The test reads true: nothing to correct.";
    else if (correction.direction === "up") answer = `Raise the ${correction.pad} pad by ${amount} (a shim of that thickness).`;
    else answer = `Move the nose pad ${amount} toward the ${correction.direction === "back" ? "back" : "front (tool side)"}.`;
    sketchLabel = correction.pad ? (correction.direction === "up" ? `${correction.pad} pad +${smallNumber(correction.amount, units)} ${s}` : `nose pad ${smallNumber(correction.amount, units)} ${s} to the ${correction.direction}`) : "reads true";
  }
  return (
    <PlannerCard
      id="tilt"
      title="Headstock or tailstock tilt"
      intro="From a test mandrel's inclination over the measuring length: the shim (vertical plane) or the sideways movement (horizontal plane) at the seating pads."
    >
      <div className="flex flex-wrap gap-6">
        <PlaneChoice plane={plane} setPlane={setPlane} />
        <fieldset className="flex flex-wrap gap-3">
          <legend className="mb-1.5 text-sm font-semibold text-ink-800">Part</legend>
          {(["headstock", "tailstock"] as const).map((value) => (
            <label key={value} className="flex min-h-11 cursor-pointer items-center gap-2 rounded-control border border-ink-300 px-4 py-2 has-[:checked]:border-brass-500 has-[:checked]:bg-brass-100">
              <input type="radio" name="part" value={value} checked={part === value} onChange={() => setPart(value)} />
              {value === "headstock" ? "Headstock" : "Tailstock"}
            </label>
          ))}
        </fieldset>
      </div>
      <Fields specs={specs} values={values} set={set} errors={errors} />
      <p className="text-sm text-ink-600">
        The nose pad is the one nearer the mandrel's free end ({part === "headstock" ? "the spindle nose" : "the sleeve end"}); the rear pad is the other.
      </p>
      <ResultBlock
        outcome={outcome}
        answer={answer}
        formula={
          "result" in outcome ? (
            <>
              c = δ × D ÷ L = {smallNumber(outcome.result.input.inclination, units)} × {lengthNumber(outcome.result.input.padDistance, units)} ÷ {lengthNumber(outcome.result.input.measuringLength, units)} ={" "}
              {smallNumber(outcome.result.correction.signed, units)} {s}
            </>
          ) : null
        }
        sketch={"result" in outcome ? <TiltSketch plane={plane} pad={outcome.result.correction.pad} direction={outcome.result.correction.direction} label={sketchLabel} /> : null}
      />
      <Caution>
        Lock out and tag out the machine before loosening the {part}. Support its weight (blocks, a jack or a crane with rated slings) before the hold-down bolts come out; never reach under it while shimming. Lift only
        with equipment rated for the load. Follow the machine's manual and local codes; this page only does the arithmetic.
      </Caution>
    </PlannerCard>
  );
}

export function ScrapingCard({ units }: { units: DisplayUnits }) {
  const u = lengthLabel(units);
  const s = smallLabel(units);
  const specs: FieldSpec[] = [
    { name: "shim", label: `Shim that made the test read true (${s})`, initial: "" },
    { name: "shimDistance", label: `Distance from the shim to the edge the part rocked on (${u})`, initial: "" },
  ];
  const { values, numbers, set } = useFields(specs);
  const [padsText, setPadsText] = useState("");
  const padNumbers = padsText.split(/[;\s]+/).filter(Boolean).slice(0, SCRAPING_LIMITS.pads + 1).map(parseTyped);
  const outcome = attempt({ ...numbers, pads: padNumbers.length ? 0 : null }, (path) => (path[0] === "padPositions" ? "pads" : first(path)), () => {
    const input = {
      shim: smallToUm(numbers.shim!, units),
      shimDistance: lengthToMm(numbers.shimDistance!, units),
      padPositions: padNumbers.map((value) => lengthToMm(value ?? Number.NaN, units)),
    };
    return { input, pads: scrapingDepths(input) };
  });
  const errors = "errors" in outcome ? outcome.errors : {};
  return (
    <PlannerCard
      id="scraping"
      title="Scraping after shimming"
      intro="The depth to scrape at each pad so the shim can come out and the part keeps the tilt the shim gave it."
    >
      <Fields specs={specs} values={values} set={set} errors={errors} />
      <Fields
        specs={[{ name: "pads", label: `Pad positions from the shim's line (${u}), separated by spaces or semicolons`, hint: `Up to ${SCRAPING_LIMITS.pads} pads; the shim's line is not scraped`, initial: "" }]}
        values={{ pads: padsText }}
        set={(_, value) => setPadsText(value.slice(0, 600))}
        errors={errors}
      />
      <ResultBlock
        outcome={outcome}
        answer={
          "result" in outcome ? (
            <ul className="space-y-1 text-base">
              {outcome.result.pads.map((pad, i) => (
                <li key={i}>
                  Pad at {lengthNumber(pad.position, units)} {u}: scrape {formatSmall(pad.depth, units)}
                </li>
              ))}
            </ul>
          ) : null
        }
        formula={"result" in outcome ? <>depth = s × x ÷ X = {smallNumber(outcome.result.input.shim, units)} × x ÷ {lengthNumber(outcome.result.input.shimDistance, units)}</> : null}
        sketch={
          "result" in outcome ? (
            <ScrapingSketch
              pads={outcome.result.pads}
              distance={outcome.result.input.shimDistance}
              labels={outcome.result.pads.map((pad) => `${smallNumber(pad.depth, units)}`)}
            />
          ) : null
        }
      />
      <p className="text-sm text-ink-600">The part ends lower, by the shim's thickness, than it sat on the shim: check the centre height after scraping.</p>
      <Caution>
        The part must be off the seating (lifted with rated equipment, or the seating scraped with the part removed and set down on blocks) before anyone scrapes. Lock out the machine. Follow the machine's manual and
        local codes.
      </Caution>
    </PlannerCard>
  );
}

export function SetOverCard({ units }: { units: DisplayUnits }) {
  const u = lengthLabel(units);
  const s = smallLabel(units);
  const specs: FieldSpec[] = [
    { name: "diameterDifference", label: `Diameter at the tailstock end − at the headstock end (${s})`, hint: "+ = larger at the tailstock end", initial: "" },
    { name: "turnedLength", label: `Distance between the two measured diameters (${u})`, initial: "" },
    { name: "betweenCentres", label: `Distance between centres (${u})`, initial: "" },
  ];
  const { values, numbers, set } = useFields(specs);
  const outcome = attempt(numbers, first, () => {
    const input = {
      diameterDifference: smallToUm(numbers.diameterDifference!, units),
      turnedLength: lengthToMm(numbers.turnedLength!, units),
      betweenCentres: lengthToMm(numbers.betweenCentres!, units),
    };
    return { input, setOver: tailstockSetOver(input) };
  });
  const errors = "errors" in outcome ? outcome.errors : {};
  let answer = "";
  let label = "";
  if ("result" in outcome) {
    const { setOver } = outcome.result;
    answer = setOver.direction
      ? `Move the tailstock ${formatSmall(setOver.amount, units)} toward the ${setOver.direction === "front" ? "front (the tool)" : "back"}.`
      : "The bar is parallel: no set-over.";
    label = setOver.direction ? `tailstock ${smallNumber(setOver.amount, units)} ${s} to the ${setOver.direction}` : "parallel";
  }
  return (
    <PlannerCard id="set-over" title="Tailstock set-over from a turned bar" intro="A bar turned between centres shows a taper when the tailstock centre is off the headstock's line.">
      <Fields specs={specs} values={values} set={set} errors={errors} />
      <ResultBlock
        outcome={outcome}
        answer={answer}
        formula={
          "result" in outcome ? (
            <>
              e = (Δd ÷ 2) × C ÷ l = ({smallNumber(outcome.result.input.diameterDifference, units)} ÷ 2) × {lengthNumber(outcome.result.input.betweenCentres, units)} ÷{" "}
              {lengthNumber(outcome.result.input.turnedLength, units)} = {smallNumber(outcome.result.setOver.signed, units)} {s}
            </>
          ) : null
        }
        sketch={"result" in outcome ? <SetOverSketch direction={outcome.result.setOver.direction} label={label} /> : null}
      />
      <Caution>Stop the spindle and lock out before measuring the bar or adjusting the tailstock. Follow the machine's manual and local codes.</Caution>
    </PlannerCard>
  );
}

export function BearingCard({ units }: { units: DisplayUnits }) {
  const inch = units === "inch";
  const s = smallLabel(units);
  const specs: FieldSpec[] = [
    { name: "pitch", label: inch ? "Adjusting nut: threads per inch" : "Adjusting nut: thread pitch (mm)", initial: "" },
    { name: "angle", label: "Back-off angle after preloading (°)", hint: "Or leave the angle and use the target below", initial: "15" },
    { name: "min", label: `Target end float, least (${s})`, hint: "From the machine's manual", initial: inch ? "0.0004" : "10" },
    { name: "max", label: `Target end float, most (${s})`, initial: inch ? "0.0012" : "30" },
    { name: "reading", label: `End float read back (${s})`, hint: "Indicator on the spindle end, pushing and pulling", initial: "" },
  ];
  const { values, numbers, set } = useFields(specs);
  const pitchMm = numbers.pitch === null ? null : inch ? (numbers.pitch > 0 ? MM_PER_INCH / numbers.pitch : Number.NaN) : numbers.pitch;
  const movement = attempt({ pitch: pitchMm, angle: numbers.angle }, first, () => ({
    pitch: pitchMm!,
    movement: nutAxialMovement({ pitch: pitchMm!, angle: numbers.angle! }),
    angleForMiddle:
      numbers.min !== null && numbers.max !== null && Number.isFinite(numbers.min) && Number.isFinite(numbers.max)
        ? safeAngle(pitchMm!, (smallToUm(numbers.min, units) + smallToUm(numbers.max, units)) / 2)
        : null,
  }));
  const check = attempt({ pitch: pitchMm, reading: numbers.reading, min: numbers.min, max: numbers.max }, first, () =>
    endFloatCheck({ pitch: pitchMm!, reading: smallToUm(numbers.reading!, units), min: smallToUm(numbers.min!, units), max: smallToUm(numbers.max!, units) }),
  );
  const errors = { ...("errors" in movement ? movement.errors : {}), ...("errors" in check ? check.errors : {}) };
  return (
    <PlannerCard
      id="bearing"
      title="Spindle bearing running clearance"
      intro="Preload the thrust bearings, then back the adjusting nut off by an angle: the nut moves along the spindle by the pitch times the angle over a full turn. Then read the end float back."
    >
      <Fields specs={specs} values={values} set={set} errors={errors} />
      <ResultBlock
        outcome={movement}
        answer={
          "result" in movement ? (
            <>
              Backing off {formatDecimal(numbers.angle ?? 0, 1)}° moves the nut {formatSmall(movement.result.movement, units)}.
              {movement.result.angleForMiddle !== null ? (
                <span className="mt-1 block text-base font-normal">For the middle of the target, back off {formatDecimal(movement.result.angleForMiddle, 1)}°.</span>
              ) : null}
            </>
          ) : null
        }
        formula={
          "result" in movement ? (
            <>
              a = p × θ ÷ 360° = {formatDecimal(movement.result.pitch, 4)} mm × {formatDecimal(numbers.angle ?? 0, 1)}° ÷ 360° = {smallNumber(movement.result.movement, units)} {s}
            </>
          ) : null
        }
        sketch={"result" in movement ? <NutSketch angle={numbers.angle ?? 0} label={`${smallNumber(movement.result.movement, units)} ${s}`} /> : null}
      />
      {"result" in check ? (
        <p role="status" data-testid="end-float-verdict" className="rounded-control border border-ink-200 px-4 py-3 text-base font-semibold text-ink-900">
          {check.result.verdict === "within"
            ? "End float within the target."
            : check.result.verdict === "tight"
              ? `Too tight: back off a further ${formatDecimal(check.result.angleChange, 1)}° and read again.`
              : `Too loose: tighten by ${formatDecimal(-check.result.angleChange, 1)}° and read again.`}
        </p>
      ) : null}
      <p className="text-sm text-ink-600">An end float of a few hundredths of a millimetre at most is common practice; the machine's manual decides.</p>
      <Caution>
        Lock out the machine before working on the spindle; the chuck or faceplate must be off or secured. Run the spindle in gently afterwards and watch the bearing temperature. Follow the machine's manual and local
        codes.
      </Caution>
    </PlannerCard>
  );
}

function safeAngle(pitch: number, clearance: number): number | null {
  try {
    return backOffAngleFor({ pitch, clearance });
  } catch {
    return null;
  }
}
