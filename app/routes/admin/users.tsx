import { data, Form, Link, useLoaderData } from "react-router";
import { z } from "zod";
import { safeText } from "~/modules/validation/text";
import { Badge, Button, SelectField, Table, Td, Th, Tr } from "~/components/ui";
import { requireRole } from "~/modules/accounts/guards.server";
import { listUsers } from "~/modules/accounts/service.server";
import { ROLES } from "~/modules/accounts/validation";
import { StaffNav } from "~/modules/accounts/components/staff-nav";
import type { Route } from "./+types/users";
import { formatDate } from "~/modules/units/dates";

export const meta: Route.MetaFunction = () => [{ title: "People — Tenthmark staff" }];

const PAGE_SIZE = 50;
const querySchema = z.object({
  role: z.enum(ROLES).optional().catch(undefined),
  page: z.coerce.number().int().min(1).max(10_000).catch(1),
});
const searchSchema = safeText({ label: "search", max: 100 }).optional();

export async function loader({ request }: Route.LoaderArgs) {
  await requireRole(request, "admin");
  const params = new URL(request.url).searchParams;
  const search = searchSchema.safeParse(params.get("q") ?? undefined);
  const query = { ...querySchema.parse(Object.fromEntries(params)), q: search.success ? search.data : undefined };
  if (!search.success) {
    return data({ query, total: 0, pages: 1, users: [], problem: search.error.issues[0]!.message }, { status: 400 });
  }
  const { users, total } = await listUsers({ search: query.q || undefined, role: query.role, limit: PAGE_SIZE, offset: (query.page - 1) * PAGE_SIZE });
  return {
    query,
    total,
    pages: Math.max(1, Math.ceil(total / PAGE_SIZE)),
    users: users.map((person) => ({ ...person, createdAt: person.createdAt.toISOString() })),
    problem: undefined,
  };
}

const inspectorTone = { none: "neutral", pending: "caution", certified: "within", rejected: "beyond" } as const;

export default function AdminUsers() {
  const { query, total, pages, users, problem } = useLoaderData<typeof loader>();
  const pageHref = (page: number) => `?${new URLSearchParams({ ...(query.q ? { q: query.q } : {}), ...(query.role ? { role: query.role } : {}), page: String(page) })}`;
  return (
    <div className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <StaffNav current="users" />
      <h1 className="mt-4 text-3xl font-extrabold tracking-tight text-ink-950">People</h1>
      <p className="mt-1 text-ink-600">
        {total} account{total === 1 ? "" : "s"}
        {query.q || query.role ? " matching" : ""}
      </p>
      <Form method="get" className="mt-5 flex flex-col gap-3 sm:flex-row sm:items-end">
        <div className="flex-1 space-y-1.5">
          <label htmlFor="people-search" className="block text-sm font-semibold text-ink-800">
            Name or e-mail
          </label>
          <input
            id="people-search"
            name="q"
            type="search"
            defaultValue={query.q ?? ""}
            aria-invalid={problem ? true : undefined}
            aria-describedby={problem ? "people-search-error" : undefined}
            className="block w-full rounded-control border border-ink-300 bg-white px-3 py-2 text-base shadow-xs focus:outline-none focus:ring-2 focus:ring-brass-400"
          />
          {problem ? (
            <p id="people-search-error" role="alert" className="text-sm font-medium text-beyond">
              {problem}
            </p>
          ) : null}
        </div>
        <SelectField label="Role" name="role" defaultValue={query.role ?? ""} placeholder="Any role" options={ROLES.map((role) => ({ value: role, label: role }))} className="sm:w-48" />
        <Button type="submit" variant="secondary">
          Filter
        </Button>
      </Form>

      <div className="mt-6">
        <Table caption="Accounts">
          <thead>
            <Tr>
              <Th>Name</Th>
              <Th>E-mail</Th>
              <Th>Roles</Th>
              <Th>Inspector</Th>
              <Th>Joined</Th>
            </Tr>
          </thead>
          <tbody>
            {users.map((person) => (
              <Tr key={person.id}>
                <Td className="font-semibold text-ink-900">{person.name}</Td>
                <Td>
                  <span className="break-all">{person.email}</span>
                  {!person.emailVerified ? <span className="ml-2 text-xs font-semibold text-caution">not confirmed</span> : null}
                </Td>
                <Td>
                  <div className="flex flex-wrap gap-1">
                    {person.roles.map((role) => (
                      <Badge key={role} tone={role === "admin" ? "brass" : "neutral"}>
                        {role}
                      </Badge>
                    ))}
                  </div>
                </Td>
                <Td>
                  {person.inspectorStatus === "none" ? <span className="text-ink-400">—</span> : <Badge tone={inspectorTone[person.inspectorStatus]}>{person.inspectorStatus}</Badge>}
                </Td>
                <Td className="tabular whitespace-nowrap text-ink-600">{formatDate(person.createdAt)}</Td>
              </Tr>
            ))}
            {users.length === 0 ? (
              <Tr>
                <Td colSpan={5} className="py-8 text-center text-ink-500">
                  Nobody matches.
                </Td>
              </Tr>
            ) : null}
          </tbody>
        </Table>
      </div>
      {pages > 1 ? (
        <nav aria-label="Pages" className="mt-4 flex gap-3 text-sm font-semibold">
          {query.page > 1 ? <Link to={pageHref(query.page - 1)}>← Newer</Link> : null}
          <span className="text-ink-500">
            Page {query.page} of {pages}
          </span>
          {query.page < pages ? <Link to={pageHref(query.page + 1)}>Older →</Link> : null}
        </nav>
      ) : null}
    </div>
  );
}
