import { useState } from "react";
import { Link, NavLink } from "react-router";
import { ButtonLink, cx } from "~/components/ui";
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
  return (
    <header className="sticky top-0 z-30 border-b border-ink-200 bg-paper/95 backdrop-blur">
      <div className="mx-auto flex h-16 max-w-6xl items-center gap-6 px-4 sm:px-6">
        <Link to="/" aria-label="Tenthmark home" className="shrink-0">
          <NameMark />
        </Link>
        <nav aria-label="Main" className="hidden flex-1 items-center gap-1 md:flex">
          {navigation.map((item) => (
            <NavLink
              key={item.to}
              to={item.to}
              className={({ isActive }) =>
                cx(
                  "rounded-(--radius-control) px-3 py-2 text-sm font-semibold",
                  isActive ? "bg-ink-100 text-ink-900" : "text-ink-600 hover:text-ink-900",
                )
              }
            >
              {item.label}
            </NavLink>
          ))}
        </nav>
        <div className="ml-auto hidden items-center gap-2 md:flex" data-slot="account">
          <AccountSlot user={user} />
        </div>
        <button
          type="button"
          className="ml-auto rounded-(--radius-control) p-2 text-ink-700 hover:bg-ink-100 md:hidden"
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
        <nav id="mobile-navigation" aria-label="Main" className="border-t border-ink-200 bg-paper px-4 pb-4 md:hidden">
          <ul className="flex flex-col py-2">
            {navigation.map((item) => (
              <li key={item.to}>
                <NavLink to={item.to} onClick={() => setMenuOpen(false)} className="block rounded px-2 py-3 text-base font-semibold text-ink-800">
                  {item.label}
                </NavLink>
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

function AccountSlot({ user }: { user: HeaderUser }) {
  if (user) {
    return (
      <>
        {user.roles.includes("admin") ? (
          <ButtonLink to="/admin/users" variant="quiet" size="sm">
            Staff
          </ButtonLink>
        ) : null}
        <ButtonLink to="/account" variant="quiet" size="sm" className="max-w-48 truncate" title={user.email}>
          {user.name}
        </ButtonLink>
        <form method="post" action="/sign-out">
          <button type="submit" className="rounded-(--radius-control) px-3 py-1.5 text-sm font-semibold text-ink-600 hover:bg-ink-100">
            Sign out
          </button>
        </form>
      </>
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
