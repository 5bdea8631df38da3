// Where a signed-in person's own work is, by the roles they hold: the header's account menu. Made by the root
// loader, so that every page's script carries the links as data rather than the list and its rules. Pure.
import type { Role } from "./validation";

export type PersonalLink = { to: string; label: string };

export function personalLinks(roles: readonly Role[]): PersonalLink[] {
  const links = [
    { to: "/account", label: "Account settings" },
    { to: "/bookings", label: "My inspection bookings" },
    { to: "/account/saved-searches", label: "Saved searches" },
    { to: "/account/watched", label: "Watched machines" },
  ];
  if (roles.includes("seller")) links.push({ to: "/sell", label: "My listings" });
  if (roles.includes("inspector")) {
    links.push({ to: "/inspector/bookings", label: "Inspection requests" });
    links.push({ to: "/inspector/profile", label: "Inspector profile" });
  }
  if (roles.some((role) => role === "seller" || role === "inspector")) links.push({ to: "/tools/corrections", label: "Correction planner" });
  if (roles.includes("admin")) {
    links.push({ to: "/admin/users", label: "Staff: people" });
    links.push({ to: "/admin/inspector-applications", label: "Staff: inspector applications" });
    links.push({ to: "/admin/payments", label: "Staff: payments" });
  }
  return links;
}
