import { data, Form, Link } from "react-router";
import { Button, Card } from "~/components/ui";
import { databaseContext } from "~/db/context";
import { stopWatchDigestsWithToken, watchDigestForToken } from "~/modules/listings/watchlist.server";
import type { Route } from "./+types/watch-unsubscribe";

export const meta: Route.MetaFunction = () => [{ title: "Stop the watched-machines e-mail — Tenthmark" }, { name: "robots", content: "noindex" }];

// The link in a digest: GET shows what will stop (mail scanners follow links, so a GET changes nothing);
// POST stops it, from the button here or from a mail client's one-click unsubscribe (RFC 8058).
export async function loader({ request, context }: Route.LoaderArgs) {
  const token = new URL(request.url).searchParams.get("token") ?? "";
  const found = await watchDigestForToken(context.get(databaseContext), token);
  return data({ token, found }, { status: found ? 200 : 404 });
}

export async function action({ request, context }: Route.ActionArgs) {
  const hasForm = /^(application\/x-www-form-urlencoded|multipart\/form-data)/.test(request.headers.get("content-type") ?? "");
  const fromForm = hasForm ? (await request.formData()).get("token") : null;
  const token = typeof fromForm === "string" && fromForm ? fromForm : (new URL(request.url).searchParams.get("token") ?? "");
  const stopped = await stopWatchDigestsWithToken(context.get(databaseContext), token);
  return data({ stopped }, { status: stopped ? 200 : 404 });
}

export default function WatchUnsubscribe({ loaderData, actionData }: Route.ComponentProps) {
  const { token, found } = loaderData;
  const manage = (
    <Link to="/account/watched" className="font-semibold underline underline-offset-2">
      Watched machines
    </Link>
  );
  return (
    <div className="mx-auto max-w-xl px-4 py-16 sm:px-6">
      <Card className="p-6 sm:p-8">
        {actionData?.stopped || (found && !found.digestsOn) ? (
          <>
            <h1 className="text-2xl font-extrabold text-ink-900">Daily e-mail stopped</h1>
            <p className="mt-2 text-ink-700">You will get no more e-mails about the machines you watch. They stay on your list; turn the e-mail on again under {manage}.</p>
          </>
        ) : found ? (
          <>
            <h1 className="text-2xl font-extrabold text-ink-900">Stop the watched-machines e-mail?</h1>
            <p className="mt-2 text-ink-700">We will stop e-mailing you about price drops, verifications and sales of the machines you watch.</p>
            <Form method="post" className="mt-6">
              <input type="hidden" name="token" value={token} />
              <Button type="submit">Stop these e-mails</Button>
            </Form>
          </>
        ) : (
          <>
            <h1 className="text-2xl font-extrabold text-ink-900">This link does not work</h1>
            <p className="mt-2 text-ink-700">The link may have been cut short. Manage these e-mails under {manage}.</p>
          </>
        )}
      </Card>
    </div>
  );
}
