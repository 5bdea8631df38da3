import { ButtonLink, Card } from "~/components/ui";
import type { Route } from "./+types/home";

export const meta: Route.MetaFunction = () => [
  { title: "Tenthmark — used machine tools with verified accuracy" },
];

const audiences = [
  {
    key: "dealers",
    heading: "For dealers",
    title: "Show the work you put into a rebuild",
    body: "List a reconditioned lathe with its specification and photos, then have a certified inspector measure it. A scored report on the listing tells buyers what a photo cannot: how the spindle runs and how the bed lies.",
    action: { to: "/sign-up?role=seller", label: "List a machine" },
  },
  {
    key: "buyers",
    heading: "For buyers",
    title: "Filter by measured accuracy, not adjectives",
    body: "Search machines by verified spindle run-out, axial slip and spindle-axis parallelism, in micrometres or inches. Before you travel, book an independent inspector and pay through the site.",
    action: { to: "/sign-up", label: "Start a search account" },
  },
  {
    key: "inspectors",
    heading: "For inspectors",
    title: "Get booked for on-site geometry checks",
    body: "Set your regions, fee and free slots. Enter readings on a tablet at the machine; the server scores every test against the tolerance table for that size of machine and publishes a signed report.",
    action: { to: "/sign-up?role=inspector", label: "Apply as an inspector" },
  },
] as const;

const measured = [
  ["Spindle run-out", "Total indicator reading on the nose and on a test mandrel in the taper"],
  ["Axial slip", "Periodic end movement of the spindle, read on a ball in the centre hole"],
  ["Spindle-axis parallelism", "Test mandrel read near and far, at 0° and 180°, in both planes"],
  ["Bed straightness", "Level readings along the carriage travel against a reference straight line"],
  ["Centre height", "Tailstock centre against headstock centre, which may sit high but never low"],
  ["Leadscrew error", "Cumulative pitch error over any window of the travel"],
] as const;

export default function Home() {
  return (
    <>
      <section className="border-b border-ink-200 bg-white">
        <div className="mx-auto grid max-w-6xl gap-10 px-4 py-14 sm:px-6 md:grid-cols-[1.25fr_1fr] md:py-20">
          <div>
            <p className="text-sm font-bold uppercase tracking-wide text-brass-600">Used machine tools, measured</p>
            <h1 className="mt-3 text-3xl font-extrabold leading-tight tracking-tight text-ink-950 sm:text-4xl">
              Buy a used lathe knowing how true it runs.
            </h1>
            <p className="mt-5 max-w-xl text-lg text-ink-600">
              Tenthmark is a marketplace where each machine can carry an on-site geometry report: readings taken by a
              certified inspector, scored by our server against tolerance tables for that class and size of machine.
            </p>
            <div className="mt-8 flex flex-wrap gap-3">
              <ButtonLink to="/sign-up?role=seller" size="lg">
                List a machine
              </ButtonLink>
              <ButtonLink to="/how-scoring-works" variant="secondary" size="lg">
                How scoring works
              </ButtonLink>
            </div>
          </div>
          <SampleReading />
        </div>
      </section>

      <section aria-labelledby="audiences" className="mx-auto max-w-6xl px-4 py-14 sm:px-6">
        <h2 id="audiences" className="sr-only">
          Who Tenthmark is for
        </h2>
        <div className="grid gap-5 md:grid-cols-3">
          {audiences.map((audience) => (
            <Card key={audience.key} className="flex flex-col p-6" data-audience={audience.key}>
              <p className="text-xs font-bold uppercase tracking-wide text-brass-600">{audience.heading}</p>
              <h3 className="mt-2 text-xl font-bold text-ink-900">{audience.title}</h3>
              <p className="mt-3 flex-1 text-ink-600">{audience.body}</p>
              <ButtonLink to={audience.action.to} variant="secondary" className="mt-6 self-start">
                {audience.action.label}
              </ButtonLink>
            </Card>
          ))}
        </div>
      </section>

      <section aria-labelledby="measured" className="border-y border-ink-200 bg-ink-50">
        <div className="mx-auto max-w-6xl px-4 py-14 sm:px-6">
          <h2 id="measured" className="text-2xl font-bold text-ink-900">
            What an inspection measures
          </h2>
          <p className="mt-2 max-w-2xl text-ink-600">
            The classic acceptance tests for centre lathes, with each result compared to a tolerance that depends on
            the machine's size and on the length measured over.
          </p>
          <dl className="mt-8 grid gap-x-8 gap-y-6 sm:grid-cols-2 lg:grid-cols-3">
            {measured.map(([term, description]) => (
              <div key={term} className="border-l-2 border-brass-400 pl-4">
                <dt className="font-bold text-ink-900">{term}</dt>
                <dd className="mt-1 text-sm text-ink-600">{description}</dd>
              </div>
            ))}
          </dl>
        </div>
      </section>

    </>
  );
}

/** A stylised extract of a scored result, to show at a glance what a report looks like. */
function SampleReading() {
  const rows = [
    { test: "Spindle nose run-out", value: "4 µm", tolerance: "10 µm", ratio: 0.4 },
    { test: "Axial slip", value: "3 µm", tolerance: "10 µm", ratio: 0.3 },
    { test: "Spindle axis, vertical", value: "+12 µm / 300", tolerance: "+20 µm", ratio: 0.6 },
    { test: "Bed, vertical plane", value: "14 µm", tolerance: "20 µm", ratio: 0.7 },
  ];
  return (
    <Card className="self-center p-5" role="figure" aria-label="Example of scored readings">
      <div className="flex items-baseline justify-between">
        <p className="text-sm font-bold text-ink-900">Example scored readings</p>
        <p className="text-xs text-ink-500">illustration</p>
      </div>
      <ul className="mt-4 space-y-3">
        {rows.map((row) => (
          <li key={row.test}>
            <div className="flex justify-between text-sm">
              <span className="font-semibold text-ink-800">{row.test}</span>
              <span className="tabular text-ink-600">
                {row.value} <span className="text-ink-400">of {row.tolerance}</span>
              </span>
            </div>
            <div className="mt-1.5 h-2 rounded-full bg-ink-100" aria-hidden="true">
              <div className="h-2 rounded-full bg-within" style={{ width: `${row.ratio * 100}%` }} />
            </div>
          </li>
        ))}
      </ul>
    </Card>
  );
}
