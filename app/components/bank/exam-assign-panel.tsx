import { getFormProps, useForm, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useState } from "react";
import { Form, useNavigation } from "react-router";
import { ROLE_LABELS } from "~/auth/roles";
import { Button } from "~/components/ui/button";
import { FormErrors, fromConform, SelectField, TextField } from "~/components/ui/field";
import { ASSIGNABLE_ROLES, assignFormSchema } from "~/routes/bank/exam-form";

type Choices = { people: { id: string; name: string; unit: string | null }[]; units: { id: string; name: string }[] };

/**
 * Assigning a published exam to chosen people, everyone on a unit or everyone holding a role,
 * with a due date. Without script every field shows; the server uses the one the radio names.
 */
export function ExamAssignPanel({ examPublished, choices, today, lastResult }: { examPublished: boolean; choices: Choices; today: string; lastResult: SubmissionResult<string[]> | undefined }) {
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "assign-exam",
    lastResult,
    defaultValue: { to: "unit" },
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: assignFormSchema(today) }),
  });
  const initialTo = typeof fields.to.initialValue === "string" ? fields.to.initialValue : "unit";
  const [to, setTo] = useState(initialTo);
  const initialPeople = Array.isArray(fields.personIds.initialValue) ? (fields.personIds.initialValue as string[]) : typeof fields.personIds.initialValue === "string" ? [fields.personIds.initialValue] : [];
  if (!examPublished) {
    return (
      <section aria-labelledby="assign-heading" className="flex flex-col gap-2">
        <h3 id="assign-heading" className="text-xl font-semibold">
          Assign
        </h3>
        <p className="text-muted">Publish the exam to assign it.</p>
      </section>
    );
  }
  return (
    <section aria-labelledby="assign-heading" className="flex flex-col gap-3">
      <h3 id="assign-heading" className="text-xl font-semibold">
        Assign
      </h3>
      <p className="max-w-3xl text-muted">
        Each active person gets one assignment that shows in their plan and on Today. People who already hold an open assignment for this exam are skipped.
      </p>
      <Form method="post" {...getFormProps(form)} className="flex flex-col gap-2 rounded-md border border-rule bg-card p-5">
        <FormErrors id={form.errorId} errors={form.errors} />
        <fieldset className="flex flex-col gap-1" aria-describedby={fields.to.errors?.length ? `${fields.to.id}-error` : undefined}>
          <legend className="font-semibold">Assign to</legend>
          <div className="flex flex-wrap gap-4">
            {(
              [
                ["people", "Chosen people"],
                ["unit", "Everyone on a unit"],
                ["role", "Everyone holding a role"],
              ] as const
            ).map(([value, label]) => (
              <label key={value} className="flex min-h-11 items-center gap-2">
                <input type="radio" name={fields.to.name} value={value} defaultChecked={initialTo === value} onChange={() => setTo(value)} className="h-5 w-5" />
                {label}
              </label>
            ))}
          </div>
          <div className="min-h-6 text-sm text-coral" id={`${fields.to.id}-error`} aria-live="polite">
            {fields.to.errors?.join(" ")}
          </div>
        </fieldset>
        <div className="grid gap-x-4 md:grid-cols-3">
          <SelectField
            key={fields.personIds.key}
            {...fromConform(fields.personIds, { keepValue: false })}
            label="People"
            hint={to === "people" ? "Hold Ctrl (or ⌘) to choose more than one." : "Used when assigning to chosen people."}
            multiple
            size={8}
            defaultValue={initialPeople}
            options={choices.people.map((p) => ({ value: p.id, label: `${p.name}${p.unit ? ` — ${p.unit}` : ""}` }))}
          />
          <div className="flex flex-col">
            <SelectField
              key={fields.unitId.key}
              {...fromConform(fields.unitId)}
              label="Unit"
              hint={to === "unit" ? "Its members and everyone whose home unit it is." : "Used when assigning to a unit."}
              options={[{ value: "", label: "Choose a unit" }, ...choices.units.map((u) => ({ value: u.id, label: u.name }))]}
            />
            <SelectField
              key={fields.role.key}
              {...fromConform(fields.role)}
              label="Role"
              hint={to === "role" ? "Everyone active who holds it." : "Used when assigning to a role."}
              options={[{ value: "", label: "Choose a role" }, ...ASSIGNABLE_ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }))]}
            />
          </div>
          <TextField key={fields.dueOn.key} {...fromConform(fields.dueOn)} type="date" label="Due date" hint={`Today (${today}) or later.`} min={today} />
        </div>
        <div>
          <Button type="submit" name="intent" value="assign" disabled={navigation.state === "submitting"}>
            {navigation.state === "submitting" ? "Assigning…" : "Assign"}
          </Button>
        </div>
      </Form>
    </section>
  );
}
