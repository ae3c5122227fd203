/**
 * The person page's "what they may do" panels: roles, and the units a manager manages. Each
 * change is its own small form with an intent button, sent with a fetcher so the details form
 * above keeps anything typed but not yet saved.
 */
import type { SubmissionResult } from "@conform-to/react";
import { useFetcher } from "react-router";
import { ROLE_LABELS, ROLES, type Role } from "~/auth/roles";
import { Button } from "~/components/ui/button";
import { FormErrors, SelectField } from "~/components/ui/field";
import { roleRemovalRefusal } from "~/routes/admin/policy";
import { PERSON_INTENTS } from "~/routes/admin/schemas";

type Result = SubmissionResult<string[]>;

function errorsOf(result: Result | undefined): string[] {
  return Object.values(result?.error ?? {}).flatMap((e) => e ?? []);
}

export function RolesPanel({ personId, personName, roles, viewerId }: { personId: string; personName: string; roles: Role[]; viewerId: string }) {
  const grant = useFetcher<Result>();
  const missing = ROLES.filter((r) => !roles.includes(r));
  return (
    <section aria-labelledby="roles-heading" className="flex flex-col gap-3">
      <h3 id="roles-heading" className="text-xl font-semibold">
        Roles
      </h3>
      {roles.length === 0 ? (
        <p className="text-muted">No roles yet: {personName} sees only the Today page.</p>
      ) : (
        <ul className="flex flex-col divide-y divide-rule rounded-md border border-rule bg-card">
          {roles.map((role) => (
            <RoleRow key={role} personId={personId} role={role} refusal={roleRemovalRefusal(viewerId, personId, role)} />
          ))}
        </ul>
      )}
      {missing.length > 0 ? (
        <grant.Form method="post" className="flex flex-col gap-1">
          <FormErrors id="grant-role-errors" errors={errorsOf(grant.data)} />
          <div className="flex flex-wrap items-end gap-3">
            <SelectField
              id="grant-role"
              name="role"
              label="Grant a role"
              options={missing.map((r) => ({ value: r, label: ROLE_LABELS[r] }))}
              className="flex min-w-48 flex-col gap-1"
            />
            <Button type="submit" variant="secondary" name="intent" value={PERSON_INTENTS.grantRole} disabled={grant.state !== "idle"} className="mb-7">
              {grant.state !== "idle" ? "Granting…" : "Grant role"}
            </Button>
          </div>
        </grant.Form>
      ) : (
        <p className="text-muted">{personName} holds every role.</p>
      )}
    </section>
  );
}

function RoleRow({ personId, role, refusal }: { personId: string; role: Role; refusal: string | null }) {
  const remove = useFetcher<Result>();
  const errors = errorsOf(remove.data);
  return (
    <li className="flex flex-col gap-2 px-4 py-2">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <span className="font-semibold">{ROLE_LABELS[role]}</span>
        {refusal ? (
          <span className="text-sm text-muted">Your own Admin role: another admin can remove it.</span>
        ) : (
          <remove.Form method="post">
            <input type="hidden" name="role" value={role} />
            <Button type="submit" variant="quiet" name="intent" value={PERSON_INTENTS.removeRole} disabled={remove.state !== "idle"}>
              {remove.state !== "idle" ? "Removing…" : "Remove"}
              <span className="sr-only"> the {ROLE_LABELS[role]} role</span>
            </Button>
          </remove.Form>
        )}
      </div>
      <FormErrors id={`remove-${role}-errors`} errors={errors} />
    </li>
  );
}

type UnitChoice = { id: string; name: string; code: string; active: boolean };

export function ManagedUnitsPanel({
  personName,
  isManager,
  managedUnits,
  units,
}: {
  personName: string;
  isManager: boolean;
  managedUnits: UnitChoice[];
  units: UnitChoice[];
}) {
  const add = useFetcher<Result>();
  const managedIds = new Set(managedUnits.map((u) => u.id));
  const choices = units.filter((u) => u.active && !managedIds.has(u.id));
  return (
    <section aria-labelledby="managed-heading" className="flex flex-col gap-3">
      <h3 id="managed-heading" className="text-xl font-semibold">
        Units managed
      </h3>
      <p className="text-muted">
        {isManager
          ? `${personName} sees compliance, expiries and survey evidence for these units.`
          : "Only managers manage units. Grant the Manager role first to choose units here."}
      </p>
      {managedUnits.length > 0 ? (
        <ul className="flex flex-col divide-y divide-rule rounded-md border border-rule bg-card">
          {managedUnits.map((u) => (
            <ManagedUnitRow key={u.id} unit={u} />
          ))}
        </ul>
      ) : isManager ? (
        <p>No units yet.</p>
      ) : null}
      {isManager && choices.length > 0 ? (
        <add.Form method="post" className="flex flex-col gap-1">
          <FormErrors id="add-managed-errors" errors={errorsOf(add.data)} />
          <div className="flex flex-wrap items-end gap-3">
            <SelectField
              id="add-managed-unit"
              name="unitId"
              label="Add a unit to manage"
              options={choices.map((u) => ({ value: u.id, label: u.name }))}
              className="flex min-w-48 flex-col gap-1"
            />
            <Button type="submit" variant="secondary" name="intent" value={PERSON_INTENTS.addManagedUnit} disabled={add.state !== "idle"} className="mb-7">
              {add.state !== "idle" ? "Adding…" : "Add unit"}
            </Button>
          </div>
        </add.Form>
      ) : null}
    </section>
  );
}

function ManagedUnitRow({ unit }: { unit: UnitChoice }) {
  const remove = useFetcher<Result>();
  return (
    <li className="flex flex-col gap-2 px-4 py-2">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <span>
          <span className="font-semibold">{unit.name}</span> <span className="font-mono text-sm text-muted">{unit.code}</span>
          {unit.active ? null : <span className="text-sm text-muted"> (inactive unit)</span>}
        </span>
        <remove.Form method="post">
          <input type="hidden" name="unitId" value={unit.id} />
          <Button type="submit" variant="quiet" name="intent" value={PERSON_INTENTS.removeManagedUnit} disabled={remove.state !== "idle"}>
            {remove.state !== "idle" ? "Removing…" : "Remove"}
            <span className="sr-only"> {unit.name} from the units managed</span>
          </Button>
        </remove.Form>
      </div>
      <FormErrors id={`remove-managed-${unit.id}-errors`} errors={errorsOf(remove.data)} />
    </li>
  );
}
