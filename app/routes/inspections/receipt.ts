import { data } from "react-router";
import { databaseContext } from "~/db/context";
import { requireUser } from "~/modules/accounts/guards.server";
import { BookingRuleError } from "~/modules/inspections/errors";
import { renderReceipt } from "~/modules/inspections/receipts.server";
import type { Route } from "./+types/receipt";

// GET: the buyer's PDF receipt for a booking's payment or one of its refunds.
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireUser(request);
  try {
    const { pdf, filename } = await renderReceipt(context.get(databaseContext), params.bookingId, user, params.file);
    return new Response(new Uint8Array(pdf), {
      headers: { "content-type": "application/pdf", "content-length": String(pdf.length), "content-disposition": `attachment; filename="${filename}"`, "cache-control": "private, no-store" },
    });
  } catch (error) {
    if (error instanceof BookingRuleError) throw data(error.message, { status: error.status });
    throw error;
  }
}
