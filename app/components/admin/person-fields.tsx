import { SelectField, TextField, fromConform } from "~/components/ui/field";
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
        {...fromConform(fields.name)}
        label="Full name"
        hint="As printed beside their signature."
        autoComplete="off"
        required
      />
      <TextField
        key={fields.email.key}
        {...fromConform(fields.email)}
        label="Work e-mail"
        hint="They sign in with it; one address per person in all of Tidemark."
        type="email"
        inputMode="email"
        autoComplete="off"
        required
      />
      <TextField
        key={fields.employeeId.key}
        {...fromConform(fields.employeeId)}
        label="Employee id (optional)"
        hint="From the hospital's HR system; unique in your organisation."
        autoComplete="off"
      />
      <TextField
        key={fields.title.key}
        {...fromConform(fields.title)}
        label="Job title (optional)"
        hint="e.g. Respiratory Therapist II"
        autoComplete="off"
      />
      <TextField
        key={fields.credentialLetters.key}
        {...fromConform(fields.credentialLetters)}
        label="Credential letters (optional)"
        hint="Post-nominal letters shown after the name, e.g. RRT or RRT-NPS."
        autoComplete="off"
      />
      <TextField
        key={fields.hireDate.key}
        {...fromConform(fields.hireDate)}
        label="Hire date"
        hint="YYYY-MM-DD. Requirements due at hire count from it."
        type="date"
        required
      />
      <SelectField
        key={fields.homeUnitId.key}
        {...fromConform(fields.homeUnitId)}
        label="Home unit"
        hint="Where they mostly work; their unit's requirements apply."
        defaultValue={text(fields.homeUnitId) ?? ""}
        options={[{ value: "", label: "No home unit" }, ...unitChoices]}
      />
      <SelectField
        key={fields.birthMonth.key}
        {...fromConform(fields.birthMonth)}
        label="Birth month (optional)"
        hint="Some state licences expire at the end of the birth month."
        defaultValue={text(fields.birthMonth) ?? ""}
        options={[{ value: "", label: "Not recorded" }, ...BIRTH_MONTH_OPTIONS]}
      />
    </div>
  );
}
