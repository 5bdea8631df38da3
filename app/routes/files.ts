import { serveStoredFile } from "~/modules/files/serve.server";
import type { Route } from "./+types/files";

export function loader({ params, request }: Route.LoaderArgs) {
  return serveStoredFile(params["*"] ?? "", request);
}
