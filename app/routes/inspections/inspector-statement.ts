import { data } from "react-router";
import { databaseContext } from "~/db/context";
import { requireRole } from "~/modules/accounts/guards.server";
import { statementCsv, statementFor } from "~/modules/inspections/ledger";
import { renderStatementPdf } from "~/modules/inspections/money-pdf.server";
import { listEarnings } from "~/modules/inspections/payouts.server";
import type { Route } from "./+types/inspector-statement";

// GET /inspector/earnings/statements/2026-11-eur.csv (or .pdf): one month's statement in one currency.
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireRole(request, "inspector");
  const match = params.file.match(/^(\d{4}-(?:0[1-9]|1[0-2]))-([a-z]{3})\.(csv|pdf)$/);
  if (!match) throw data("No such statement: the address names a month (YYYY-MM), a currency and csv or pdf.", { status: 404 });
  const [, month, currency, format] = match as unknown as [string, string, string, "csv" | "pdf"];
  const { entries } = await listEarnings(context.get(databaseContext), user.id);
  const statement = statementFor(entries, month, currency.toUpperCase());
  const filename = `tenthmark-statement-${month}-${currency}.${format}`;
  const headers = { "content-disposition": `attachment; filename="${filename}"`, "cache-control": "private, no-store" };
  if (format === "csv") return new Response(statementCsv(statement), { headers: { ...headers, "content-type": "text/csv; charset=utf-8" } });
  const pdf = await renderStatementPdf(statement, user);
  return new Response(new Uint8Array(pdf), { headers: { ...headers, "content-type": "application/pdf", "content-length": String(pdf.length) } });
}
