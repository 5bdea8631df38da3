import { handleAuthRequest } from "~/modules/accounts/service.server";
import type { Route } from "./+types/api.auth";

// better-auth's endpoints (/api/auth/*), with our wrong-password limit in front of sign-in.
export async function loader({ request }: Route.LoaderArgs) {
  return handleAuthRequest(request);
}

export async function action({ request }: Route.ActionArgs) {
  return handleAuthRequest(request);
}
