import { redirect } from "react-router";
import { signOut } from "~/modules/accounts/service.server";
import type { Route } from "./+types/sign-out";

export async function loader() {
  throw redirect("/");
}

export async function action({ request }: Route.ActionArgs) {
  throw redirect("/", { headers: await signOut(request) });
}
