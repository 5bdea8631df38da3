// The seller's rebuild record: readings as found and as rebuilt on the report form's own test cards, scored live by
// the same engine, then the work done. The server scores again on save.
import { useMemo, useState, type ReactNode } from "react";
import { Form, Link, useNavigation } from "react-router";
import { KINDS_FOR_METHOD, type ToleranceProfile } from "~/geometry";
import { Badge, Button, CheckboxField, SelectField, TextAreaField, TextField } from "~/components/ui";
import { InstrumentsCard } from "~/modules/reports/components/entry/instruments-card";
import { SafetyCautions } from "~/modules/reports/components/safety";
import { TestCard } from "~/modules/reports/components/entry/test-card";
import { emptyTestEntry, isEntryKind, type TestEntry } from "~/modules/reports/form";
import { previewRebuild, REBUILD_PHOTOS, WORK_ITEMS, type ReadingSetName, type RebuildForm } from "~/modules/rebuilds/record";
import { findProfile } from "~/geometry";

type Errors = Record<string, string[]>;

const SETS: { name: ReadingSetName; label: string; intro: string }[] = [
  { name: "asFound", label: "As found", intro: "The readings before any work: what the machine was when it came in." },
  { name: "asRebuilt", label: "As rebuilt", intro: "The readings after the work, taken the same way." },
];

function under(errors: Errors, prefix: string): Errors {
  const found: Errors = {};
  for (const [key, messages] of Object.entries(errors)) {
    if (key === prefix) found.entry = messages;
    else if (key.startsWith(`${prefix}.`)) found[key.slice(prefix.length + 1)] = messages;
  }
  return found;
}

export function RebuildEntry({
  listing,
  profiles,
  initial,
  status,
  errors,
  machine,
  photos,
  as = "seller",
}: {
  machine?: ReactNode;
  /** Who is entering it: an inspector's record is shown as entered by them, still not verified without a signed report. */
  as?: "seller" | "staff" | "inspector";
  photos: { id: string; thumbnailUrl: string }[];
  listing: { id: string; slug: string; title: string; categoryLabel: string; status: string };
  profiles: ToleranceProfile[];
  initial: RebuildForm;
  status: "new" | "draft" | "published";
  errors: Errors | null;
}) {
  const [form, setForm] = useState<RebuildForm>(initial);
  const [set, setSet] = useState<ReadingSetName>("asFound");
  const profile = findProfile(profiles, form.profile.key, form.profile.version);
  const preview = useMemo(() => previewRebuild(form, profile), [form, profile]);
  const navigation = useNavigation();
  const busy = navigation.state === "submitting";
  const serverErrors = errors ?? {};
  const change = (mutate: (draft: RebuildForm) => void) =>
    setForm((previous) => {
      const next = structuredClone(previous);
      mutate(next);
      return next;
    });
  const current = preview[set];
  const completeCount = (name: ReadingSetName) => preview[name]?.measuredCount ?? 0;

  return (
    <div className="mx-auto max-w-5xl px-4 py-8 pb-32 sm:px-6">
      <p className="text-sm font-bold uppercase tracking-wide text-brass-600">Rebuild record</p>
      <h1 className="mt-1 text-3xl font-extrabold text-ink-900">{listing.title}</h1>
      <p className="mt-2 max-w-3xl text-ink-600">
        {as === "inspector"
          ? "Record the machine as found and as rebuilt, test by test, with the work done, for the listing's seller. Buyers see both sets side by side, marked as entered by you; they stay unverified until a signed report of yours (or another inspector's) confirms the rebuilt figures."
          : "Record the machine as found and as rebuilt, test by test, with the work done. Buyers see both sets side by side, marked as declared by you, until a certified inspector's signed report confirms the rebuilt figures."}{" "}
        Need the arithmetic for shims, scraping or bearings?{" "}
        <Link to="/tools/corrections" className="font-semibold text-ink-900 underline underline-offset-2">
          Open the correction planner
        </Link>
        .
      </p>
      {machine}
      <div className="mt-4">
        {/* The readings are taken and the work done at a machine that can hurt: the report form's cautions, and the rebuild's own. */}
        <SafetyCautions heading="Measuring and rebuilding: safety">
          <p className="mt-2">
            Before shimming, scraping or adjusting bearings: lock out and tag out the supply, support a headstock on blocks or rated lifting gear before its bolts come out, and never reach under it.
          </p>
        </SafetyCautions>
      </div>
      {status === "published" ? (
        <p className="mt-3">
          <Badge tone="within">Published on the listing</Badge>
        </p>
      ) : null}

      <div className="mt-6 grid gap-4 sm:grid-cols-2">
        <SelectField
          label="Tolerance profile"
          value={`${form.profile.key}@${form.profile.version}`}
          options={profiles.map((candidate) => ({ value: `${candidate.key}@${candidate.version}`, label: `${candidate.title} (v${candidate.version})` }))}
          errors={serverErrors.profile}
          onChange={(event) =>
            change((draft) => {
              const [key, version] = event.target.value.split("@");
              draft.profile = { key: key!, version: Number(version) };
            })
          }
        />
        <SelectField
          label="Readings typed in"
          value={form.units}
          options={[
            { value: "mm", label: "mm and µm" },
            { value: "inch", label: "inches" },
          ]}
          onChange={(event) => change((draft) => void (draft.units = event.target.value === "inch" ? "inch" : "mm"))}
        />
      </div>

      <div className="mt-6">
        <InstrumentsCard
          instruments={form.instruments}
          units={form.units}
          measuredOn={form.asRebuilt.measuredOn || form.asFound.measuredOn}
          description="The instruments both sets were read with; each test then names its instrument, and its resolution is checked as on a report."
          onChange={(mutate) => change((draft) => mutate(draft.instruments))}
        />
      </div>

      <div role="tablist" aria-label="Reading set" className="mt-8 flex gap-2">
        {SETS.map((candidate) => (
          <button
            key={candidate.name}
            type="button"
            role="tab"
            aria-selected={set === candidate.name}
            onClick={() => setSet(candidate.name)}
            className={
              set === candidate.name
                ? "min-h-11 rounded-control bg-ink-900 px-4 py-2 text-base font-semibold text-white"
                : "min-h-11 rounded-control bg-white px-4 py-2 text-base font-semibold text-ink-800 ring-1 ring-inset ring-ink-300"
            }
          >
            {candidate.label} <span className="text-sm font-normal opacity-80">({completeCount(candidate.name)} {completeCount(candidate.name) === 1 ? "test" : "tests"})</span>
          </button>
        ))}
      </div>
      <section role="tabpanel" aria-label={SETS.find((candidate) => candidate.name === set)!.label} className="mt-4 space-y-4">
        <p className="text-ink-600">{SETS.find((candidate) => candidate.name === set)!.intro}</p>
        {serverErrors[set] ? <p className="font-medium text-beyond">{serverErrors[set]!.join(" ")}</p> : null}
        <TextField
          key={`${set}-date`}
          label="Measured on"
          type="date"
          className="max-w-xs"
          value={form[set].measuredOn}
          errors={serverErrors[`${set}.measuredOn`]}
          onChange={(event) => change((draft) => void (draft[set].measuredOn = event.target.value))}
        />
        {current?.tests.map((testPreview) => {
          const code = testPreview.test.code;
          const kind = KINDS_FOR_METHOD[testPreview.test.method].filter(isEntryKind)[0]!;
          const entry = form[set].tests[code];
          return (
            <TestCard
              key={`${set}-${code}`}
              preview={testPreview}
              entry={entry}
              units={form.units}
              instruments={form.instruments}
              serverErrors={under(serverErrors, `${set}.tests.${code}`)}
              onChange={(mutate: (entry: TestEntry) => void) =>
                change((draft) => {
                  const next = draft[set].tests[code] ?? emptyTestEntry(entry?.kind ?? kind);
                  mutate(next);
                  draft[set].tests[code] = next;
                })
              }
              onClear={() => change((draft) => void delete draft[set].tests[code])}
              photo={null}
              disabled={busy}
            />
          );
        })}
      </section>

      <section className="mt-10 space-y-4" aria-labelledby="work-heading">
        <h2 id="work-heading" className="text-xl font-bold text-ink-900">
          Work done
        </h2>
        <div className="grid gap-2 sm:grid-cols-2">
          {WORK_ITEMS.map((item) => (
            <CheckboxField
              key={item.value}
              label={item.label}
              checked={form.workDone.includes(item.value)}
              onChange={(event) => {
                const checked = event.currentTarget.checked;
                change((draft) => {
                  draft.workDone = checked ? [...new Set([...draft.workDone, item.value])] : draft.workDone.filter((value) => value !== item.value);
                });
              }}
            />
          ))}
        </div>
        <TextAreaField
          label="Notes on the work"
          hint="What was done and how: e.g. shims under the rear pad, then the seating scraped in three pads."
          value={form.notes}
          errors={serverErrors.notes}
          onChange={(event) => change((draft) => void (draft.notes = event.target.value))}
        />
      </section>

      <section className="mt-10 space-y-3" aria-labelledby="photos-heading">
        <h2 id="photos-heading" className="text-xl font-bold text-ink-900">
          Photos of the work
        </h2>
        {photos.length ? (
          <>
            <p className="text-sm text-ink-600">Choose up to {REBUILD_PHOTOS} of the listing's photos to show with the record (add more on the listing's page).</p>
            {serverErrors.photoIds ? <p className="text-sm font-medium text-beyond">{serverErrors.photoIds.join(" ")}</p> : null}
            <ul className="grid grid-cols-2 gap-3 sm:grid-cols-4">
              {photos.map((photo, i) => {
                const chosen = form.photoIds.includes(photo.id);
                return (
                  <li key={photo.id}>
                    <label className="block cursor-pointer rounded-control border border-ink-200 p-2 has-[:checked]:border-brass-500 has-[:checked]:bg-brass-100">
                      <img src={photo.thumbnailUrl} alt={`Listing photo ${i + 1}`} className="aspect-[4/3] w-full rounded object-cover" />
                      <span className="mt-2 flex items-center gap-2 text-sm font-semibold text-ink-800">
                        <input
                          type="checkbox"
                          checked={chosen}
                          disabled={!chosen && form.photoIds.length >= REBUILD_PHOTOS}
                          onChange={(event) => {
                            const checked = event.currentTarget.checked;
                            change((draft) => {
                              draft.photoIds = checked ? [...draft.photoIds, photo.id] : draft.photoIds.filter((id) => id !== photo.id);
                            });
                          }}
                        />
                        Shows the work
                      </span>
                    </label>
                  </li>
                );
              })}
            </ul>
          </>
        ) : (
          <p className="text-sm text-ink-600">Add photos to the listing first; then choose here the ones that show the work.</p>
        )}
      </section>

      <Form method="post" className="sticky bottom-0 mt-8 flex flex-wrap items-center gap-3 border-t border-ink-200 bg-paper py-4">
        <input type="hidden" name="form" value={JSON.stringify(form)} />
        {serverErrors.form ? <p className="w-full font-medium text-beyond">{serverErrors.form.join(" ")}</p> : null}
        <Button type="submit" name="intent" value="save" variant="secondary" disabled={busy}>
          Save draft
        </Button>
        <Button type="submit" name="intent" value="publish" disabled={busy}>
          {status === "published" ? "Save and update the listing" : "Publish on the listing"}
        </Button>
        <Link to={`/machines/${listing.slug}`} className="text-sm font-semibold text-ink-700 underline underline-offset-2">
          View the listing
        </Link>
      </Form>
    </div>
  );
}
