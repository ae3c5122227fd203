import { Form, Link, useLoaderData, useNavigation } from "react-router";
import { requireViewer } from "~/auth/gate.server";
import { ROLE_LABELS, ROLES } from "~/auth/roles";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { buttonClass } from "~/components/ui/button";
import { FilterActions } from "~/components/ui/filter-actions";
import { SelectField, TextField } from "~/components/ui/field";
import { listPeople, unitOptions } from "~/db/queries/admin-people.server";
import { readPeopleFilter, type PeopleFilter } from "./schemas";
import type { Route } from "./+types/people";

export async function loader({ request, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "people:manage");
  const filter = readPeopleFilter(new URL(request.url));
  const [list, units] = await Promise.all([listPeople(viewer.org.id, filter), unitOptions(viewer.org.id)]);
  return { filter, ...list, units };
}

/** The list's address with some filters changed, for the page links. */
function hrefFor(filter: PeopleFilter, change: Partial<PeopleFilter>): string {
  const next = { ...filter, ...change };
  const params = new URLSearchParams();
  if (next.q) params.set("q", next.q);
  if (next.unit) params.set("unit", next.unit);
  if (next.role) params.set("role", next.role);
  if (next.status !== "active") params.set("status", next.status);
  if (next.page > 1) params.set("page", String(next.page));
  const query = params.toString();
  return `/admin/people${query ? `?${query}` : ""}`;
}

export default function People() {
  const { filter, rows, total, page, pageSize, units } = useLoaderData<typeof loader>();
  const navigation = useNavigation();
  const searching = navigation.state === "loading" && navigation.location.pathname === "/admin/people";
  const first = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const last = Math.min(total, page * pageSize);
  const filtered = !!(filter.q || filter.unit || filter.role || filter.status !== "active");
  return (
    <section aria-labelledby="people-heading" className="flex flex-col gap-5">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <h2 id="people-heading" className="text-2xl font-semibold">
          People
        </h2>
        <Link to="/admin/people/new" className={buttonClass("primary", "no-underline")}>
          Add a person
        </Link>
      </div>

      <Form method="get" role="search" aria-label="Find people" className="grid gap-x-4 rounded-md border border-rule bg-card p-4 md:grid-cols-[2fr_1fr_1fr_1fr_auto]">
        <TextField id="people-q" name="q" type="search" label="Search" hint="Name, e-mail or employee id" defaultValue={filter.q} autoComplete="off" />
        <SelectField
          id="people-unit"
          name="unit"
          label="Unit"
          hint="Home, works on or manages"
          defaultValue={filter.unit}
          options={[{ value: "", label: "All units" }, ...units.map((u) => ({ value: u.id, label: u.active ? u.name : `${u.name} (inactive)` }))]}
        />
        <SelectField
          id="people-role"
          name="role"
          label="Role"
          hint="Holds this role"
          defaultValue={filter.role}
          options={[{ value: "", label: "All roles" }, ...ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }))]}
        />
        <SelectField
          id="people-status"
          name="status"
          label="Status"
          hint="Can sign in or not"
          defaultValue={filter.status}
          options={[
            { value: "active", label: "Active" },
            { value: "inactive", label: "Inactive" },
            { value: "all", label: "Active and inactive" },
          ]}
        />
        <FilterActions clearTo="/admin/people" filtered={filtered} className="md:mb-7 md:self-end" />
      </Form>

      <p role="status" aria-live="polite" className="text-muted">
        {searching
          ? "Searching…"
          : total === 0
            ? filtered
              ? "Nobody matches. Try fewer words or clear the filters."
              : "No people yet. Add the first person."
            : `Showing ${first}–${last} of ${total} ${total === 1 ? "person" : "people"}, by name.`}
      </p>

      {rows.length > 0 ? (
        <LedgerTable caption="People of your organisation">
          <thead>
            <tr>
              <Th>Name</Th>
              <Th>Work e-mail</Th>
              <Th numeric>Employee id</Th>
              <Th>Home unit</Th>
              <Th>Roles</Th>
              <Th numeric>Hire date</Th>
              <Th>Status</Th>
            </tr>
          </thead>
          <tbody>
            {rows.map((p) => (
              <tr key={p.id}>
                <Td>
                  <Link to={`/admin/people/${p.id}`} className="font-semibold">
                    {p.name}
                  </Link>
                  {p.credentialLetters ? <span className="text-muted">, {p.credentialLetters}</span> : null}
                  {p.title ? <span className="block text-sm text-muted">{p.title}</span> : null}
                </Td>
                <Td className="break-all">{p.email}</Td>
                <Td numeric>{p.employeeId ?? <span className="text-muted">—</span>}</Td>
                <Td>{p.homeUnit ?? <span className="text-muted">None</span>}</Td>
                <Td>{p.roles.length ? p.roles.map((r) => ROLE_LABELS[r]).join(", ") : <span className="text-muted">No roles</span>}</Td>
                <Td numeric className="whitespace-nowrap">
                  {p.hireDate ?? <span className="text-muted">—</span>}
                </Td>
                <Td>{p.active ? "Active" : <span className="font-semibold text-coral">Inactive</span>}</Td>
              </tr>
            ))}
          </tbody>
        </LedgerTable>
      ) : null}

      {total > pageSize ? (
        <nav aria-label="Pages of people" className="flex gap-2">
          {page > 1 ? (
            <Link to={hrefFor(filter, { page: page - 1 })} className={buttonClass("secondary", "no-underline")}>
              Previous {pageSize}
            </Link>
          ) : null}
          {last < total ? (
            <Link to={hrefFor(filter, { page: page + 1 })} className={buttonClass("secondary", "no-underline")}>
              Next {Math.min(pageSize, total - last)}
            </Link>
          ) : null}
        </nav>
      ) : null}
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "People · Admin · Tidemark" }];
