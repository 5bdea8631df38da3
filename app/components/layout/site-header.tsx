import { useState } from "react";
import { Link, useLocation } from "react-router";
import { ButtonLink } from "~/components/ui/button";
import type { PersonalLink } from "~/modules/accounts/personal-links";
import { NameMark } from "./name-mark";

/** The signed-in person as the pages see them (root loader); null when signed out. */
export type HeaderUser = {
  name: string;
  email: string;
  /** The account menu's links, by the roles held (made on the server). */
  links: PersonalLink[];
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
    <header className="site-header">
      <div className="site-header-bar">
        <Link to="/" aria-label="Tenthmark home" className="shrink-0">
          <NameMark />
        </Link>
        <nav aria-label="Main" className="hidden flex-1 items-center gap-1 lg:flex">
          {navigation.map((item) => (
            <Link
              key={item.to}
              to={item.to}
              aria-current={current(item.to)}
              className="site-nav-link"
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
          className="site-menu-button"
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
        <nav id="mobile-navigation" aria-label="Main" className="site-menu">
          <ul className="flex flex-col py-2">
            {navigation.map((item) => (
              <li key={item.to}>
                <Link to={item.to} aria-current={current(item.to)} onClick={() => setMenuOpen(false)} className="site-menu-link">
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

function AccountSlot({ user }: { user: HeaderUser }) {
  if (user) {
    return (
      // <details> opens and closes without JavaScript; the links close it by navigating away.
      <details className="group relative">
        <summary
          className="site-account-summary"
          title={user.email}
        >
          <span className="min-w-0 truncate">{user.name}</span>
          <svg viewBox="0 0 12 12" className="site-chevron" aria-hidden="true">
            <path d="M2.5 4.5 6 8l3.5-3.5" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" />
          </svg>
        </summary>
        <div className="site-account-menu">
          <p className="truncate px-4 py-1.5 text-xs text-ink-500">{user.email}</p>
          <ul>
            {user.links.map((link) => (
              <li key={link.to}>
                <Link
                  to={link.to}
                  className="site-account-link"
                  onClick={(event) => event.currentTarget.closest("details")?.removeAttribute("open")}
                >
                  {link.label}
                </Link>
              </li>
            ))}
          </ul>
          <form method="post" action="/sign-out" className="mt-1 border-t border-ink-100 pt-1">
            <button type="submit" className="site-account-link w-full text-left font-semibold text-ink-600">
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
