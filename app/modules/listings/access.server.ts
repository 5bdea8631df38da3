import { requireRole, requireVerifiedUser } from "~/modules/accounts/guards.server";

/** Selling needs a confirmed address and the seller role (or staff); each listing's owner is checked in the service. */
export async function requireSeller(request: Request) {
  await requireVerifiedUser(request);
  return requireRole(request, ["seller", "admin"]);
}
