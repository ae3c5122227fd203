import { getFormProps, useForm, type SubmissionResult } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { useState } from "react";
import { data, Form, useActionData, useFetcher, useLoaderData, useNavigation, useSearchParams } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { AskTwice } from "~/components/admin/ask-twice";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { Button } from "~/components/ui/button";
import { FormErrors, TextField, fromConform } from "~/components/ui/field";
import { createUnit, getUnit, listUnits, renameUnit, setUnitActive, unitChecks, type UnitRow } from "~/db/queries/admin.server";
import { ConfirmSchema, createUnitSchema, UNIT_INTENTS } from "./schemas";
import type { Route } from "./+types/units";

const clientUnitSchema = createUnitSchema();

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "org:settings");
  return { units: await listUnits(viewer.org.id) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "org:settings");
  const orgId = viewer.org.id;
  const actorId = viewer.person.id;
  const formData = await request.formData();
  // After a change, come back to the same list (keeping the highlight of a just-added unit).
  const added = new URL(request.url).searchParams.get("added");
  const back = added ? `/admin/units?added=${encodeURIComponent(added)}` : "/admin/units";

  /** The unit the form names, only if it is this organisation's: anyone else's is a 404. */
  const targetUnit = async () => {
    const unitId = formData.get("unitId");
    const unit = typeof unitId === "string" && unitId ? await getUnit(orgId, unitId) : undefined;
    if (!unit) notFound("We could not find that unit.");
    return unit;
  };

  switch (formData.get("intent")) {
    case UNIT_INTENTS.create: {
      const submission = await parseWithZod(formData, { schema: createUnitSchema(unitChecks(orgId)), async: true });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const result = await createUnit(orgId, actorId, submission.value);
      if (!result.ok) return data(submission.reply({ fieldErrors: { [result.field]: [takenMessage(result.field)] } }), { status: 400 });
      return redirectWithToast(`/admin/units?added=${result.unitId}`, `Unit added: ${submission.value.name} (${submission.value.code}).`);
    }
    case UNIT_INTENTS.rename: {
      const unit = await targetUnit();
      const submission = await parseWithZod(formData, { schema: createUnitSchema(unitChecks(orgId, unit.id)), async: true });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      const result = await renameUnit(orgId, actorId, unit.id, submission.value);
      if (!result.ok) return data(submission.reply({ fieldErrors: { [result.field]: [takenMessage(result.field)] } }), { status: 400 });
      return redirectWithToast(back, `Unit saved: ${submission.value.name} (${submission.value.code}).`);
    }
    case UNIT_INTENTS.deactivate: {
      const unit = await targetUnit();
      const submission = parseWithZod(formData, { schema: ConfirmSchema });
      if (submission.status !== "success") return data(submission.reply(), { status: 400 });
      await setUnitActive(orgId, actorId, unit.id, false);
      return redirectWithToast(back, `${unit.name} is deactivated. Reactivate it here at any time.`);
    }
    case UNIT_INTENTS.reactivate: {
      const unit = await targetUnit();
      await setUnitActive(orgId, actorId, unit.id, true);
      return redirectWithToast(back, `${unit.name} is active again.`);
    }
    default:
      throw data({ message: "That button does not do anything here. Reload the page and try again." }, { status: 400 });
  }
}

function takenMessage(field: "name" | "code"): string {
  return field === "name" ? "Another unit already has this name." : "Another unit already uses this short code.";
}

export default function Units() {
  const { units } = useLoaderData<typeof loader>();
  const [params] = useSearchParams();
  const added = params.get("added");
  const active = units.filter((u) => u.active).length;
  return (
    <section aria-labelledby="units-heading" className="flex flex-col gap-6">
      <div className="flex flex-col gap-1">
        <h2 id="units-heading" className="text-2xl font-semibold">
          Units
        </h2>
        <p className="text-muted">
          {units.length === 0
            ? "No units yet. Add the first one below."
            : `${active} active of ${units.length}. A deactivated unit keeps its people and history; it is only left out of new choices.`}
        </p>
      </div>
      {units.length > 0 ? (
        <LedgerTable caption="Units of your organisation">
          <thead>
            <tr>
              <Th>Unit</Th>
              <Th>Short code</Th>
              <Th numeric>Home staff</Th>
              <Th numeric>Managers</Th>
              <Th>Status</Th>
              <Th>Changes</Th>
            </tr>
          </thead>
          <tbody>
            {units.map((u) => (
              // Keyed by what can change, so an open rename or question closes once saved.
              <UnitRows key={`${u.id}:${u.name}:${u.code}:${u.active}`} unit={u} justAdded={u.id === added} />
            ))}
          </tbody>
        </LedgerTable>
      ) : null}
      <AddUnit key={added ?? "none"} />
    </section>
  );
}

function UnitRows({ unit, justAdded }: { unit: UnitRow; justAdded: boolean }) {
  const [renaming, setRenaming] = useState(false);
  const reactivate = useFetcher();
  return (
    <>
      <tr className={justAdded ? "bg-sea-wash" : undefined}>
        <Td className="font-semibold">
          {unit.name}
          {justAdded ? <span className="ml-2 text-sm font-normal text-muted">(just added)</span> : null}
        </Td>
        <Td className="font-mono text-sm">{unit.code}</Td>
        <Td numeric>{unit.homeStaff}</Td>
        <Td numeric>{unit.managers}</Td>
        <Td>{unit.active ? "Active" : <span className="text-muted">Inactive</span>}</Td>
        <Td>
          <div className="flex flex-wrap items-start gap-2">
            <Button variant="secondary" aria-expanded={renaming} aria-controls={`rename-${unit.id}-panel`} onClick={() => setRenaming((r) => !r)}>
              {renaming ? "Close" : "Rename"}
              <span className="sr-only"> {unit.name}</span>
            </Button>
            {unit.active ? (
              <AskTwice
                id={`deactivate-${unit.id}`}
                triggerLabel={`Deactivate`}
                question={`Deactivate ${unit.name}? ${unit.homeStaff} active ${unit.homeStaff === 1 ? "person calls" : "people call"} it home; they keep it, but it is left out of new choices.`}
                confirmLabel={`Yes, deactivate ${unit.name}`}
                intent={UNIT_INTENTS.deactivate}
                fields={{ unitId: unit.id }}
              />
            ) : (
              <reactivate.Form method="post">
                <input type="hidden" name="unitId" value={unit.id} />
                <Button type="submit" variant="secondary" name="intent" value={UNIT_INTENTS.reactivate} disabled={reactivate.state !== "idle"}>
                  Reactivate<span className="sr-only"> {unit.name}</span>
                </Button>
              </reactivate.Form>
            )}
          </div>
        </Td>
      </tr>
      {renaming ? (
        <tr id={`rename-${unit.id}-panel`}>
          <Td colSpan={6} className="bg-paper">
            <RenameUnit unit={unit} />
          </Td>
        </tr>
      ) : null}
    </>
  );
}

function RenameUnit({ unit }: { unit: UnitRow }) {
  const fetcher = useFetcher<SubmissionResult<string[]>>();
  const [form, fields] = useForm({
    id: `rename-${unit.id}`,
    lastResult: fetcher.data,
    defaultValue: { name: unit.name, code: unit.code },
    constraint: getZodConstraint(clientUnitSchema),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: clientUnitSchema }),
  });
  return (
    <fetcher.Form method="post" {...getFormProps(form)} aria-label={`Rename ${unit.name}`} className="flex flex-col gap-2 py-2">
      <FormErrors id={form.errorId} errors={form.errors} />
      <input type="hidden" name="unitId" value={unit.id} />
      <div className="grid gap-x-4 sm:grid-cols-[2fr_1fr]">
        <TextField
          key={fields.name.key}
          {...fromConform(fields.name)}
          label="Unit name"
          autoComplete="off"
          required
        />
        <TextField
          key={fields.code.key}
          {...fromConform(fields.code)}
          label="Short code"
          autoComplete="off"
          required
        />
      </div>
      <div>
        <Button type="submit" name="intent" value={UNIT_INTENTS.rename} disabled={fetcher.state !== "idle"}>
          {fetcher.state !== "idle" ? "Saving…" : "Save unit"}
        </Button>
      </div>
    </fetcher.Form>
  );
}

function AddUnit() {
  const lastResult = useActionData<typeof action>();
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "add-unit",
    lastResult,
    constraint: getZodConstraint(clientUnitSchema),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: clientUnitSchema }),
  });
  const adding = navigation.state === "submitting" && navigation.formData?.get("intent") === UNIT_INTENTS.create;
  return (
    <section aria-labelledby="add-unit-heading" className="max-w-2xl rounded-md border border-rule bg-card p-5">
      <h3 id="add-unit-heading" className="mb-3 text-xl font-semibold">
        Add a unit
      </h3>
      <Form method="post" {...getFormProps(form)} className="flex flex-col gap-2">
        <FormErrors id={form.errorId} errors={form.errors} />
        <div className="grid gap-x-4 sm:grid-cols-[2fr_1fr]">
          <TextField
            key={fields.name.key}
            {...fromConform(fields.name)}
            label="Unit name"
            hint="As staff say it, e.g. Adult ICU."
            autoComplete="off"
            required
          />
          <TextField
            key={fields.code.key}
            {...fromConform(fields.code)}
            label="Short code"
            hint="For narrow columns, e.g. AICU."
            autoComplete="off"
            required
          />
        </div>
        <div>
          <Button type="submit" name="intent" value={UNIT_INTENTS.create} disabled={adding}>
            {adding ? "Adding…" : "Add unit"}
          </Button>
        </div>
      </Form>
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Units · Admin · Tidemark" }];
