import { useEffect } from "react";
import { useLocation } from "react-router";

// The path on screen; a browser shows one page at a time, so one variable for the module is enough.
let shownPath: string | undefined;

/**
 * After an in-app navigation to another page, says the new page's title in a live region and moves focus
 * to its main heading, as a full page load puts a screen reader at the top of the new page. Only a new path
 * counts: a changed query (a search filter, the units toggle) keeps focus where the person is working.
 * React Router has no announcer of its own; this one is kept to a few lines, as every page downloads it.
 */
export function RouteAnnouncer() {
  const { pathname } = useLocation();
  useEffect(() => {
    // Effects run after the commit that rendered the new page with its <title>.
    if (shownPath && shownPath != pathname) {
      const heading = document.querySelector<HTMLElement>("main h1");
      if (heading) {
        heading.tabIndex = -1;
        heading.focus({ preventScroll: true });
      }
      document.getElementById("route-announcer")!.textContent = document.title;
    }
    shownPath = pathname;
  }, [pathname]);
  return <div id="route-announcer" className="sr-only" aria-live="polite" />;
}
