import type { FieldMetadata } from "@conform-to/react";
import { SelectField, TextAreaField, TextField, fromConform } from "~/components/ui/field";
import { METHOD_LABELS, METHODS } from "~/domain/checkoffs/methods";

type Fields = Record<"title" | "skill" | "method" | "steps" | "references", FieldMetadata<string | undefined>>;

const str = (v: unknown) => (typeof v === "string" ? v : undefined);

/** The checklist form's fields, shared by "add" and "edit". */
export function ChecklistFields({ fields }: { fields: Fields }) {
  return (
    <>
      <TextField key={fields.title.key} id={fields.title.id} name={fields.title.name} label="Title" defaultValue={str(fields.title.initialValue)} errors={fields.title.errors} required />
      <TextField
        key={fields.skill.key}
        {...fromConform(fields.skill, { keepValue: false })}
        label="Skill it clears"
        hint="As the Clearance board names it, e.g. In-line suctioning."
        defaultValue={str(fields.skill.initialValue)}
        required
      />
      <SelectField
        key={fields.method.key}
        {...fromConform(fields.method, { keepValue: false })}
        label="Method"
        options={[{ value: "", label: "Choose the method…" }, ...METHODS.map((m) => ({ value: m, label: METHOD_LABELS[m] }))]}
        defaultValue={str(fields.method.initialValue)}
      />
      <TextAreaField
        key={fields.steps.key}
        {...fromConform(fields.steps, { keepValue: false })}
        label="Steps, in order"
        hint="One step per line. Start a line with ! to mark the step critical."
        rows={10}
        defaultValue={str(fields.steps.initialValue)}
        required
      />
      <TextAreaField
        key={fields.references.key}
        {...fromConform(fields.references, { keepValue: false })}
        label="References"
        hint="Local procedures and published sources; the device's instructions for use always win."
        rows={3}
        defaultValue={str(fields.references.initialValue)}
      />
    </>
  );
}
