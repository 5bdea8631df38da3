import { Link } from "react-router";

/** Tabs of the staff pages. */
export function StaffNav({ current }: { current: "users" | "applications" | "profiles" | "demand" }) {
  const items = [
    { key: "users", to: "/admin/users", label: "People" },
    { key: "applications", to: "/admin/inspector-applications", label: "Inspector applications" },
    { key: "profiles", to: "/admin/profiles", label: "Tolerance profiles" },
    { key: "demand", to: "/admin/inspector-demand", label: "Inspector demand" },
  ] as const;
  return (
    <nav aria-label="Staff" className="flex flex-wrap gap-1 border-b border-ink-200">
      {items.map((item) => (
        <Link
          key={item.key}
          to={item.to}
          aria-current={item.key === current ? "page" : undefined}
          className={`-mb-px border-b-2 px-3 py-2 text-sm font-semibold ${item.key === current ? "border-brass-500 text-ink-900" : "border-transparent text-ink-600 hover:text-ink-900"}`}
        >
          {item.label}
        </Link>
      ))}
    </nav>
  );
}
