import { SelectField, TextField } from "~/components/ui/field";
import { BIRTH_MONTH_OPTIONS } from "~/routes/admin/schemas";

/** What this component needs of a conform field (a subset of its FieldMetadata). */
type Field = { id: string; name: string; key?: string; initialValue?: unknown; errors?: string[] };

export type PersonFieldSet = Record<
  "name" | "email" | "employeeId" | "title" | "credentialLetters" | "hireDate" | "homeUnitId" | "birthMonth",
  Field
>;

const text = (f: Field) => (typeof f.initialValue === "string" ? f.initialValue : undefined);

/**
 * The person's details, shared by "Add a person" and the person page. Units that are
 * deactivated stay selectable only when they are already the person's home unit.
 */
export function PersonFields({
  fields,
  units,
  currentHomeUnitId,
}: {
  fields: PersonFieldSet;
  units: { id: string; name: string; active: boolean }[];
  currentHomeUnitId?: string | null;
}) {
  const unitChoices = units
    .filter((u) => u.active || u.id === currentHomeUnitId)
    .map((u) => ({ value: u.id, label: u.active ? u.name : `${u.name} (inactive)` }));
  return (
    <div className="grid gap-x-5 md:grid-cols-2">
      <TextField
        key={fields.name.key}
        id={fields.name.id}
        name={fields.name.name}
        label="Full name"
        hint="As printed beside their signature."
        defaultValue={text(fields.name)}
        errors={fields.name.errors}
        autoComplete="off"
        required
      />
      <TextField
        key={fields.email.key}
        id={fields.email.id}
        name={fields.email.name}
        label="Work e-mail"
        hint="They sign in with it; one address per person in all of Tidemark."
        type="email"
        inputMode="email"
        defaultValue={text(fields.email)}
        errors={fields.email.errors}
        autoComplete="off"
        required
      />
      <TextField
        key={fields.employeeId.key}
        id={fields.employeeId.id}
        name={fields.employeeId.name}
        label="Employee id (optional)"
        hint="From the hospital's HR system; unique in your organisation."
        defaultValue={text(fields.employeeId)}
        errors={fields.employeeId.errors}
        autoComplete="off"
      />
      <TextField
        key={fields.title.key}
        id={fields.title.id}
        name={fields.title.name}
        label="Job title (optional)"
        hint="e.g. Respiratory Therapist II"
        defaultValue={text(fields.title)}
        errors={fields.title.errors}
        autoComplete="off"
      />
      <TextField
        key={fields.credentialLetters.key}
        id={fields.credentialLetters.id}
        name={fields.credentialLetters.name}
        label="Credential letters (optional)"
        hint="Post-nominal letters shown after the name, e.g. RRT or RRT-NPS."
        defaultValue={text(fields.credentialLetters)}
        errors={fields.credentialLetters.errors}
        autoComplete="off"
      />
      <TextField
        key={fields.hireDate.key}
        id={fields.hireDate.id}
        name={fields.hireDate.name}
        label="Hire date"
        hint="YYYY-MM-DD. Requirements due at hire count from it."
        type="date"
        defaultValue={text(fields.hireDate)}
        errors={fields.hireDate.errors}
        required
      />
      <SelectField
        key={fields.homeUnitId.key}
        id={fields.homeUnitId.id}
        name={fields.homeUnitId.name}
        label="Home unit"
        hint="Where they mostly work; their unit's requirements apply."
        defaultValue={text(fields.homeUnitId) ?? ""}
        errors={fields.homeUnitId.errors}
        options={[{ value: "", label: "No home unit" }, ...unitChoices]}
      />
      <SelectField
        key={fields.birthMonth.key}
        id={fields.birthMonth.id}
        name={fields.birthMonth.name}
        label="Birth month (optional)"
        hint="Some state licences expire at the end of the birth month."
        defaultValue={text(fields.birthMonth) ?? ""}
        errors={fields.birthMonth.errors}
        options={[{ value: "", label: "Not recorded" }, ...BIRTH_MONTH_OPTIONS]}
      />
    </div>
  );
}
