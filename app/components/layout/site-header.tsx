import { useState } from "react";
import { Link, useLocation } from "react-router";
import { ButtonLink } from "~/components/ui/button";
import { cx } from "~/components/ui/cx";
import type { Role } from "~/modules/accounts/validation";
import { NameMark } from "./name-mark";

/** The signed-in person as the pages see them (root loader); null when signed out. */
export type HeaderUser = {
  name: string;
  email: string;
  roles: Role[];
  displayUnits: "mm" | "inch";
  emailVerified: boolean;
} | null;

const navigation = [
  { to: "/machines", label: "Machines" },
  { to: "/inspectors", label: "Inspectors" },
  { to: "/sell", label: "Sell a machine" },
  { to: "/how-scoring-works", label: "How scoring works" },
];

export function SiteHeader({ user }: { user: HeaderUser }) {
  const [menuOpen, setMenuOpen] = useState(false);
  // The section a page belongs to, as a link to it marks itself (a plain Link: React Router's NavLink brings
  // view-transition code that no page uses into every page's script).
  const { pathname } = useLocation();
  const current = (to: string) => (pathname === to || pathname.startsWith(`${to}/`) ? "page" : undefined);
  return (
    <header className="sticky top-0 z-30 border-b border-ink-200 bg-paper/95 backdrop-blur">
      <div className="mx-auto flex h-16 max-w-6xl items-center gap-6 px-4 sm:px-6">
        <Link to="/" aria-label="Tenthmark home" className="shrink-0">
          <NameMark />
        </Link>
        <nav aria-label="Main" className="hidden flex-1 items-center gap-1 lg:flex">
          {navigation.map((item) => (
            <Link
              key={item.to}
              to={item.to}
              aria-current={current(item.to)}
              className="rounded-control px-3 py-2 text-sm font-semibold text-ink-600 hover:text-ink-900 aria-[current=page]:bg-ink-100 aria-[current=page]:text-ink-900"
            >
              {item.label}
            </Link>
          ))}
        </nav>
        <div className="ml-auto hidden items-center gap-2 lg:flex" data-slot="account">
          <AccountSlot user={user} />
        </div>
        <button
          type="button"
          className="ml-auto rounded-control p-2 text-ink-700 hover:bg-ink-100 lg:hidden"
          aria-expanded={menuOpen}
          aria-controls="mobile-navigation"
          onClick={() => setMenuOpen((open) => !open)}
        >
          <span className="sr-only">{menuOpen ? "Close menu" : "Open menu"}</span>
          <svg viewBox="0 0 20 20" className="size-6" aria-hidden="true">
            <path d={menuOpen ? "M5 5l10 10M15 5L5 15" : "M3 6h14M3 10h14M3 14h14"} stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
          </svg>
        </button>
      </div>
      {menuOpen ? (
        <nav id="mobile-navigation" aria-label="Main" className="border-t border-ink-200 bg-paper px-4 pb-4 lg:hidden">
          <ul className="flex flex-col py-2">
            {navigation.map((item) => (
              <li key={item.to}>
                <Link to={item.to} aria-current={current(item.to)} onClick={() => setMenuOpen(false)} className="block rounded px-2 py-3 text-base font-semibold text-ink-800">
                  {item.label}
                </Link>
              </li>
            ))}
          </ul>
          <div className="flex gap-2" data-slot="account">
            <AccountSlot user={user} />
          </div>
        </nav>
      ) : null}
    </header>
  );
}

/** Where a signed-in person's own work is, by the roles they hold. */
function personalLinks(user: NonNullable<HeaderUser>) {
  const links = [
    { to: "/account", label: "Account settings" },
    { to: "/bookings", label: "My inspection bookings" },
    { to: "/account/saved-searches", label: "Saved searches" },
    { to: "/account/watched", label: "Watched machines" },
  ];
  if (user.roles.includes("seller")) links.push({ to: "/sell", label: "My listings" });
  if (user.roles.includes("inspector")) {
    links.push({ to: "/inspector/bookings", label: "Inspection requests" });
    links.push({ to: "/inspector/profile", label: "Inspector profile" });
  }
  if (user.roles.some((role) => role === "seller" || role === "inspector")) links.push({ to: "/tools/corrections", label: "Correction planner" });
  if (user.roles.includes("admin")) {
    links.push({ to: "/admin/users", label: "Staff: people" });
    links.push({ to: "/admin/inspector-applications", label: "Staff: inspector applications" });
    links.push({ to: "/admin/payments", label: "Staff: payments" });
  }
  return links;
}

function AccountSlot({ user }: { user: HeaderUser }) {
  if (user) {
    return (
      // <details> opens and closes without JavaScript; the links close it by navigating away.
      <details className="group relative">
        <summary
          className="flex h-8 max-w-52 cursor-pointer list-none items-center gap-1.5 rounded-control px-3 text-sm font-semibold text-ink-800 hover:bg-ink-100 [&::-webkit-details-marker]:hidden"
          title={user.email}
        >
          <span className="min-w-0 truncate">{user.name}</span>
          <svg viewBox="0 0 12 12" className="size-3 shrink-0 transition-transform group-open:rotate-180" aria-hidden="true">
            <path d="M2.5 4.5 6 8l3.5-3.5" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" />
          </svg>
        </summary>
        <div className="absolute right-0 z-40 mt-2 w-64 rounded-panel border border-ink-200 bg-white py-1.5 shadow-lg">
          <p className="truncate px-4 py-1.5 text-xs text-ink-500">{user.email}</p>
          <ul>
            {personalLinks(user).map((link) => (
              <li key={link.to}>
                <Link
                  to={link.to}
                  className="block px-4 py-2 text-sm font-medium text-ink-800 hover:bg-ink-50"
                  onClick={(event) => event.currentTarget.closest("details")?.removeAttribute("open")}
                >
                  {link.label}
                </Link>
              </li>
            ))}
          </ul>
          <form method="post" action="/sign-out" className="mt-1 border-t border-ink-100 pt-1">
            <button type="submit" className="block w-full px-4 py-2 text-left text-sm font-semibold text-ink-600 hover:bg-ink-50">
              Sign out
            </button>
          </form>
        </div>
      </details>
    );
  }
  return (
    <>
      <ButtonLink to="/sign-in" variant="quiet" size="sm">
        Sign in
      </ButtonLink>
      <ButtonLink to="/sign-up" size="sm">
        Create account
      </ButtonLink>
    </>
  );
}
