import { data } from "react-router";
import type { Database } from "~/db/client.server";
import { requireRole } from "~/modules/accounts/guards.server";
import { getProfileVersion } from "./service.server";

/**
 * The draft version a staff member is editing: only its author edits it, and only while it is a draft (a
 * second staff member reviews and publishes). Anything else is answered with the reason and its status.
 */
export async function requireOwnDraft(request: Request, db: Database, key: string, versionParam: string | undefined) {
  const staff = await requireRole(request, "admin");
  const version = Number(versionParam);
  const found = Number.isInteger(version) && version > 0 ? await getProfileVersion(db, key, version) : null;
  if (!found) throw data("There is no such version.", { status: 404 });
  if (found.summary.status !== "draft") throw data("A published version cannot be changed; draft a new version.", { status: 409 });
  if (found.summary.authorId !== staff.id) throw data("Only the draft's author edits it; a second staff member reviews and publishes.", { status: 403 });
  return { staff, found, version };
}
