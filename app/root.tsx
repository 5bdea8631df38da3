import "~/modules/security/zod-without-eval";
import { isRouteErrorResponse, Link, Links, Meta, Outlet, Scripts, ScrollRestoration, useRouteLoaderData } from "react-router";
import type { Route } from "./+types/root";
import "./app.css";
import { RouteAnnouncer } from "~/components/layout/route-announcer";
import { SiteFooter } from "~/components/layout/site-footer";
import { SiteHeader, type HeaderUser } from "~/components/layout/site-header";
import { databaseMiddleware } from "~/db/middleware.server";
import { getOptionalUser } from "~/modules/accounts/guards.server";
import { personalLinks } from "~/modules/accounts/personal-links";
import { securityMiddleware } from "~/modules/security/middleware.server";
import { useNonce } from "~/modules/security/nonce";

// Security first: a refused cross-origin post never reaches the database.
export const middleware: Route.MiddlewareFunction[] = [securityMiddleware, databaseMiddleware];

export async function loader({ request }: Route.LoaderArgs) {
  const signedIn = await getOptionalUser(request);
  const user: HeaderUser = signedIn && {
    name: signedIn.name,
    email: signedIn.email,
    links: personalLinks(signedIn.roles),
    displayUnits: signedIn.displayUnits,
    emailVerified: signedIn.emailVerified,
  };
  return { user };
}

export const meta: Route.MetaFunction = () => [
  { title: "Tenthmark — used machine tools with verified accuracy" },
  {
    name: "description",
    content:
      "Buy and sell used lathes and machine tools with on-site geometric accuracy reports from certified inspectors.",
  },
];

export function Layout({ children }: { children: React.ReactNode }) {
  const data = useRouteLoaderData<typeof loader>("root");
  const nonce = useNonce();
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <meta name="theme-color" content="#17212b" />
        <link rel="icon" href="/favicon.svg" type="image/svg+xml" />
        <Meta />
        <Links />
      </head>
      <body className="flex min-h-screen flex-col">
        <a href="#main" className="skip-link">
          Skip to content
        </a>
        <SiteHeader user={data?.user ?? null} />
        <main id="main" className="flex-1">
          {children}
        </main>
        <SiteFooter />
        <RouteAnnouncer />
        <ScrollRestoration nonce={nonce} />
        <Scripts nonce={nonce} />
      </body>
    </html>
  );
}

export default function App() {
  return <Outlet />;
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  let title = "Something went wrong";
  let detail = "The page could not be shown. Try again in a moment; if it keeps happening, tell us what you were doing.";
  if (isRouteErrorResponse(error)) {
    if (error.status === 404) {
      title = "Page not found";
      detail = "There is nothing at this address. The listing may have been withdrawn, or the link mistyped.";
    } else if (error.status === 403) {
      title = "Not allowed";
      detail =
        typeof error.data === "string" && error.data
          ? error.data
          : "Your account does not have access to this page. Sign in with an account that does, or go back.";
    } else {
      title = `${error.status} ${error.statusText}`;
      if (typeof error.data === "string" && error.data) detail = error.data;
    }
  } else if (import.meta.env.DEV && error instanceof Error) {
    detail = error.message;
  }
  return (
    <section className="error-page">
      <p className="ui-eyebrow text-sm text-brass-600">Tenthmark</p>
      <h1 className="mt-2 text-3xl font-extrabold text-ink-900">{title}</h1>
      <p className="mt-4 text-ink-600">{detail}</p>
      <Link to="/" className="ui-text-link mt-8 inline-block text-ink-900 underline-offset-4">
        Back to the home page
      </Link>
    </section>
  );
}
