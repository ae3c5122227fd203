import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useActionData, useFetcher, useLoaderData, useNavigation } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { ROLE_LABELS } from "~/auth/roles";
import { AskTwice } from "~/components/admin/ask-twice";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { ManagedUnitsPanel, RolesPanel } from "~/components/admin/person-access";
import { PersonFields } from "~/components/admin/person-fields";
import { Button } from "~/components/ui/button";
import { FormErrors } from "~/components/ui/field";
import { personHistory } from "~/db/queries/admin-history.server";
import { getPerson, personChecks, setPersonActive, unitOptions, updatePerson } from "~/db/queries/admin-people.server";
import { addManagedUnit, grantRole, removeManagedUnit, removeRole } from "~/db/queries/admin-roles.server";
import type { Viewer } from "~/auth/context";
import { describePersonEvent, formatInstant } from "./history-words";
import { deactivationRefusal, roleRemovalRefusal } from "./policy";
import { ConfirmSchema, createPersonSchema, ManagedUnitSchema, PERSON_INTENTS, RoleSchema } from "./schemas";
import type { Route } from "./+types/person";

const clientSchema = createPersonSchema();

const TAKEN = {
  email: "This address was just given to someone else. Each person signs in with their own address.",
  employeeId: "This employee id was just given to someone else in your organisation.",
} as const;

/** The person named in the address, only if they belong to the viewer's organisation. */
async function personInScope(viewer: Viewer, personId: string | undefined) {
  const person = personId ? await getPerson(viewer.org.id, personId) : undefined;
  if (!person) notFound("We could not find that person in your organisation.");
  return person;
}

export async function loader({ params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "people:manage");
  const person = await personInScope(viewer, params.personId);
  const [units, history] = await Promise.all([unitOptions(viewer.org.id), personHistory(viewer.org.id, person.id, 20)]);
  return {
    // Picked field by field: the signing PIN hash and its counters never leave the server.
    person: {
      id: person.id,
      name: person.name,
      email: person.email,
      employeeId: person.employeeId,
      title: person.title,
      credentialLetters: person.credentialLetters,
      hireDate: person.hireDate,
      homeUnitId: person.homeUnitId,
      birthMonth: person.birthMonth,
      active: person.active,
      roles: person.roles,
      managedUnits: person.managedUnits,
    },
    units,
    history: history.map((h) => ({
      seq: h.seq,
      when: formatInstant(h.at, viewer.org.timeZone),
      what: describePersonEvent(h.action, h.detail),
      by: h.actor ?? "Tidemark",
    })),
    viewerId: viewer.person.id,
    timeZone: viewer.org.timeZone,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "people:manage");
  const person = await personInScope(viewer, params.personId);
  const orgId = viewer.org.id;
  const actorId = viewer.person.id;
  const here = `/admin/people/${person.id}`;
  const formData = await request.formData();

  switch (formData.get("intent")) {
    case PERSON_INTENTS.update: {
      const submission = await parseWithZod(formData, { schema: createPersonSchema(personChecks(orgId, person.id)), async: true });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const result = await updatePerson(orgId, actorId, person.id, submission.value);
      if (!result.ok) return data(submission.reply({ fieldErrors: { [result.field]: [TAKEN[result.field]] } }), { status: 400 });
      return redirectWithToast(here, result.changed?.length ? `Saved ${submission.value.name}'s details.` : "Nothing changed, so nothing was saved.");
    }
    case PERSON_INTENTS.deactivate: {
      const submission = parseWithZod(formData, { schema: ConfirmSchema });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const refusal = deactivationRefusal(actorId, person.id);
      if (refusal) return data(submission.reply({ formErrors: [refusal] }), { status: 400 });
      const { sessionsEnded } = await setPersonActive(orgId, actorId, person.id, false);
      const signedOut = sessionsEnded > 0 ? ` and signed out of ${sessionsEnded} open session${sessionsEnded === 1 ? "" : "s"}` : "";
      return redirectWithToast(here, `${person.name} is deactivated${signedOut}. They cannot sign in until reactivated.`);
    }
    case PERSON_INTENTS.reactivate: {
      await setPersonActive(orgId, actorId, person.id, true);
      return redirectWithToast(here, `${person.name} is active again and can sign in.`);
    }
    case PERSON_INTENTS.grantRole: {
      requireViewer(context, "roles:grant");
      const submission = parseWithZod(formData, { schema: RoleSchema });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const role = submission.value.role;
      await grantRole(orgId, actorId, person.id, role);
      return redirectWithToast(here, `${person.name} now holds the ${ROLE_LABELS[role]} role.`);
    }
    case PERSON_INTENTS.removeRole: {
      requireViewer(context, "roles:grant");
      const submission = parseWithZod(formData, { schema: RoleSchema });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const role = submission.value.role;
      const refusal = roleRemovalRefusal(actorId, person.id, role);
      if (refusal) return data(submission.reply({ formErrors: [refusal] }), { status: 400 });
      const result = await removeRole(orgId, actorId, person.id, role);
      if (!result.ok) return data(submission.reply({ formErrors: [result.message] }), { status: 400 });
      return redirectWithToast(here, `${person.name} no longer holds the ${ROLE_LABELS[role]} role.`);
    }
    case PERSON_INTENTS.addManagedUnit: {
      requireViewer(context, "roles:grant");
      const submission = parseWithZod(formData, { schema: ManagedUnitSchema });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      if (!person.roles.includes("manager")) {
        return data(submission.reply({ formErrors: [`Grant ${person.name} the Manager role first: only managers manage units.`] }), { status: 400 });
      }
      const result = await addManagedUnit(orgId, actorId, person.id, submission.value.unitId);
      if (!result.ok) return data(submission.reply({ fieldErrors: { unitId: [result.message] } }), { status: 400 });
      return redirectWithToast(here, `${person.name} now manages ${result.unitName}.`);
    }
    case PERSON_INTENTS.removeManagedUnit: {
      requireViewer(context, "roles:grant");
      const submission = parseWithZod(formData, { schema: ManagedUnitSchema });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const result = await removeManagedUnit(orgId, actorId, person.id, submission.value.unitId);
      if (!result.ok) return data(submission.reply({ fieldErrors: { unitId: [result.message] } }), { status: 400 });
      return redirectWithToast(here, `${person.name} no longer manages ${result.unitName}.`);
    }
    default:
      throw data({ message: "That button does not do anything here. Reload the page and try again." }, { status: 400 });
  }
}

export default function PersonPage() {
  const { person, units, history, viewerId, timeZone } = useLoaderData<typeof loader>();
  return (
    <div className="flex flex-col gap-8">
      <div className="flex flex-col gap-1">
        <p>
          <Link to="/admin/people">← All people</Link>
        </p>
        <h2 className="text-2xl font-semibold">
          {person.name}
          {person.credentialLetters ? <span className="font-normal text-muted">, {person.credentialLetters}</span> : null}
        </h2>
        <p className="text-muted">
          {[person.title, person.email].filter(Boolean).join(" · ")} ·{" "}
          {person.active ? <span className="text-ink">Active</span> : <span className="font-semibold text-coral">Inactive: cannot sign in</span>}
        </p>
      </div>
      <DetailsForm person={person} units={units} />
      <div className="grid gap-8 lg:grid-cols-2">
        <RolesPanel personId={person.id} personName={person.name} roles={person.roles} viewerId={viewerId} />
        <ManagedUnitsPanel personName={person.name} isManager={person.roles.includes("manager")} managedUnits={person.managedUnits} units={units} />
      </div>
      <AccountPanel key={String(person.active)} person={person} viewerId={viewerId} />
      <section aria-labelledby="history-heading" className="flex flex-col gap-3">
        <h3 id="history-heading" className="text-xl font-semibold">
          Recent history
        </h3>
        {history.length === 0 ? (
          <p className="text-muted">Nothing recorded yet.</p>
        ) : (
          <LedgerTable caption={`The last ${history.length} recorded events about ${person.name}, newest first (times in ${timeZone})`} maxHeight="max-h-[28rem]">
            <thead>
              <tr>
                <Th>When</Th>
                <Th>What</Th>
                <Th>By</Th>
              </tr>
            </thead>
            <tbody>
              {history.map((h) => (
                <tr key={h.seq}>
                  <Td className="whitespace-nowrap tabular-nums">{h.when}</Td>
                  <Td>{h.what}</Td>
                  <Td>{h.by}</Td>
                </tr>
              ))}
            </tbody>
          </LedgerTable>
        )}
      </section>
    </div>
  );
}

type LoadedPerson = Route.ComponentProps["loaderData"]["person"];

function DetailsForm({ person, units }: { person: LoadedPerson; units: Route.ComponentProps["loaderData"]["units"] }) {
  const lastResult = useActionData<typeof action>();
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: `person-${person.id}`,
    lastResult,
    defaultValue: {
      name: person.name,
      email: person.email,
      employeeId: person.employeeId ?? "",
      title: person.title ?? "",
      credentialLetters: person.credentialLetters ?? "",
      hireDate: person.hireDate ?? "",
      homeUnitId: person.homeUnitId ?? "",
      birthMonth: person.birthMonth ? String(person.birthMonth) : "",
    },
    constraint: getZodConstraint(clientSchema),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: clientSchema }),
  });
  const saving = navigation.state === "submitting" && navigation.formData?.get("intent") === PERSON_INTENTS.update;
  return (
    <section aria-labelledby="details-heading" className="flex flex-col gap-3">
      <h3 id="details-heading" className="text-xl font-semibold">
        Details
      </h3>
      <Form method="post" {...getFormProps(form)} className="flex flex-col gap-2 rounded-md border border-rule bg-card p-5">
        <FormErrors id={form.errorId} errors={form.errors} />
        <PersonFields fields={fields} units={units} currentHomeUnitId={person.homeUnitId} />
        <div>
          <Button type="submit" name="intent" value={PERSON_INTENTS.update} disabled={saving}>
            {saving ? "Saving…" : "Save details"}
          </Button>
        </div>
      </Form>
    </section>
  );
}

function AccountPanel({ person, viewerId }: { person: LoadedPerson; viewerId: string }) {
  const reactivate = useFetcher();
  const refusal = deactivationRefusal(viewerId, person.id);
  return (
    <section aria-labelledby="account-heading" className="flex max-w-2xl flex-col gap-3">
      <h3 id="account-heading" className="text-xl font-semibold">
        Account
      </h3>
      {person.active ? (
        refusal ? (
          <p className="text-muted">{refusal}</p>
        ) : (
          <>
            <p className="text-muted">Deactivate someone who has left: they are signed out at once and cannot sign in. Their records stay.</p>
            <AskTwice
              id="deactivate-person"
              triggerLabel={`Deactivate ${person.name}`}
              question={`Deactivate ${person.name}? Every open session of theirs ends now and they cannot sign in until reactivated. Nothing they recorded is removed.`}
              confirmLabel={`Yes, deactivate ${person.name}`}
              intent={PERSON_INTENTS.deactivate}
            />
          </>
        )
      ) : (
        <reactivate.Form method="post" className="flex flex-col gap-2">
          <p className="text-muted">{person.name} is deactivated and cannot sign in.</p>
          <div>
            <Button type="submit" variant="secondary" name="intent" value={PERSON_INTENTS.reactivate} disabled={reactivate.state !== "idle"}>
              {reactivate.state !== "idle" ? "Reactivating…" : `Reactivate ${person.name}`}
            </Button>
          </div>
        </reactivate.Form>
      )}
    </section>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.person.name ?? "Person"} · People · Admin · Tidemark` }];
