// The instruments used for a set of readings: kind, description, resolution and calibration date. Each test card's
// "Instrument" choice lists these. Shared by the report form and the rebuild record.
import { Button, Card, CardBody, CardHeader, SelectField, TextField } from "~/components/ui";
import { INSTRUMENT_KINDS, instrumentReads, unitLabels, type InstrumentEntry } from "../../form";

export function InstrumentsCard({
  instruments,
  units,
  measuredOn,
  onChange,
  description,
}: {
  instruments: InstrumentEntry[];
  units: "mm" | "inch";
  /** The date of the readings, to flag an instrument whose calibration had lapsed by then. */
  measuredOn: string;
  onChange: (mutate: (instruments: InstrumentEntry[]) => void) => void;
  description?: string;
}) {
  const labels = unitLabels(units);
  return (
    <Card>
      <CardHeader title="Instruments" description={description ?? `Resolution is the smallest step the instrument reads (${labels.resolution}; µm/m for levels).`} />
      <CardBody className="space-y-4">
        {instruments.map((instrument, i) => (
          <div key={instrument.id} className="grid gap-3 rounded-control border border-ink-200 p-3 sm:grid-cols-2 sm:items-end" data-instrument={i}>
            <SelectField
              label={`${i + 1}. Kind`}
              value={instrument.kind}
              options={INSTRUMENT_KINDS.map((kind) => ({ value: kind.value, label: kind.label }))}
              onChange={(event) => onChange((draft) => void (draft[i]!.kind = event.target.value as typeof instrument.kind))}
            />
            <TextField label="Make, model, serial" value={instrument.description} onChange={(event) => onChange((draft) => void (draft[i]!.description = event.target.value))} />
            <TextField
              label={`Resolution (${instrumentReads(instrument.kind) === "tilt" ? "µm/m" : labels.resolution})`}
              inputMode="decimal"
              value={instrument.resolution}
              disabled={instrumentReads(instrument.kind) === "none"}
              onChange={(event) => onChange((draft) => void (draft[i]!.resolution = event.target.value))}
            />
            <TextField
              label="Calibration due"
              type="date"
              value={instrument.calibrationDue}
              errors={instrument.calibrationDue && measuredOn && instrument.calibrationDue < measuredOn ? ["Overdue on the date of the tests."] : null}
              onChange={(event) => onChange((draft) => void (draft[i]!.calibrationDue = event.target.value))}
            />
            <Button variant="quiet" size="sm" className="justify-self-start sm:col-span-2" onClick={() => onChange((draft) => void draft.splice(i, 1))}>
              Remove this instrument<span className="sr-only"> (instrument {i + 1})</span>
            </Button>
          </div>
        ))}
        <Button
          variant="secondary"
          size="sm"
          onClick={() =>
            onChange((draft) => {
              const next = Math.max(0, ...draft.map((entry) => Number(entry.id.replace(/\D/g, "")) || 0)) + 1;
              draft.push({ id: `i${next}`, kind: "dial-indicator", description: "", resolution: "", calibrationDue: "" });
            })
          }
        >
          + Add an instrument
        </Button>
      </CardBody>
    </Card>
  );
}
