/**
 * The Bench settings: mode, the settings that mode uses, alarm limits and the patient. Edits are
 * held as typed and applied together with "Apply settings" (or Enter in a field) after the
 * simulator's own check; a refused field shows its message, naming the field and its allowed
 * range, right under it, and nothing is applied.
 */
import type { Dispatch, SetStateAction } from "react";
import { RAMP_CONVENTION } from "~/domain/bench/defaults";
import { MODES, type EffortKind, type FlowPattern, type Mode } from "~/domain/bench/types";
import { buttonClass } from "~/components/ui/button";
import { FormErrors, SelectField, TextField } from "~/components/ui/field";
import {
  EFFORT_FIELDS,
  EFFORT_KIND_PATH,
  EFFORT_LABELS,
  FLOW_PATTERN_LABELS,
  FLOW_PATTERN_PATH,
  LIMIT_FIELDS,
  MODE_FIELDS,
  MODE_LABELS,
  MODE_NOTES,
  MODE_PATH,
  PATIENT_FIELDS,
  SETTING_FIELDS,
  type BenchDraft,
  type NumberField,
} from "./bench-form";

export const fieldId = (path: string) => `bench-${path.replace(/\./g, "-")}`;

export interface SettingsErrors {
  fieldErrors: Record<string, string[]>;
  formErrors: string[];
}

interface Props {
  draft: BenchDraft;
  setDraft: Dispatch<SetStateAction<BenchDraft>>;
  errors: SettingsErrors | null;
  dirty: boolean;
  note: string;
  onApply: () => void;
}

export function SettingsForm({ draft, setDraft, errors, dirty, note, onApply }: Props) {
  const errorsFor = (path: string) => errors?.fieldErrors[path] ?? null;
  const number = (field: NumberField) => (
    <TextField
      key={field.path}
      id={fieldId(field.path)}
      name={field.path}
      className="flex flex-col justify-end gap-1"
      label={`${field.label} (${field.range.unit})`}
      hint={`Allowed ${field.range.min} to ${field.range.max}.${field.hint ? ` ${field.hint}` : ""}`}
      errors={errorsFor(field.path)}
      inputMode="decimal"
      autoComplete="off"
      value={draft.values[field.path] ?? ""}
      onChange={(e) => {
        const value = e.target.value;
        setDraft((d) => ({ ...d, values: { ...d.values, [field.path]: value } }));
      }}
    />
  );

  return (
    <form
      noValidate
      aria-labelledby="settings-heading"
      className="rounded-lg border border-rule bg-card p-4"
      onSubmit={(e) => {
        e.preventDefault();
        onApply();
      }}
    >
      <h2 id="settings-heading" className="text-lg font-semibold">
        Settings
      </h2>
      <p className="text-sm text-muted">
        Change any field, then choose Apply settings (or press Enter). A new mode starts a new run; other changes act from the
        next breath. Nothing is applied while a field is out of range.
      </p>
      <FormErrors id="settings-form-errors" errors={errors?.formErrors} />
      <fieldset className="mt-4 min-w-0">
        <legend className="mb-2 text-base font-semibold text-sea">Mode and its settings</legend>
        <div className="grid gap-x-6 gap-y-1 sm:grid-cols-2 xl:grid-cols-4">
          <SelectField
            id={fieldId(MODE_PATH)}
            className="flex flex-col gap-1 sm:col-span-2"
            label="Mode"
            hint={MODE_NOTES[draft.mode]}
            errors={errorsFor(MODE_PATH)}
            value={draft.mode}
            options={MODES.map((m) => ({ value: m, label: MODE_LABELS[m] }))}
            onChange={(e) => {
              const mode = e.target.value as Mode;
              setDraft((d) => ({ ...d, mode }));
            }}
          />
          {draft.mode === "volume-control" ? (
            <SelectField
              id={fieldId(FLOW_PATTERN_PATH)}
              className="flex flex-col gap-1 sm:col-span-2"
              label="Flow pattern"
              hint={RAMP_CONVENTION}
              errors={errorsFor(FLOW_PATTERN_PATH)}
              value={draft.flowPattern}
              options={(["constant", "ramp"] as const).map((p) => ({ value: p, label: FLOW_PATTERN_LABELS[p] }))}
              onChange={(e) => {
                const flowPattern = e.target.value as FlowPattern;
                setDraft((d) => ({ ...d, flowPattern }));
              }}
            />
          ) : null}
          {MODE_FIELDS[draft.mode].map((k) => number(SETTING_FIELDS[k]))}
        </div>
      </fieldset>
      <div className="mt-4 grid gap-x-6 gap-y-4 lg:grid-cols-2">
        <fieldset className="min-w-0">
          <legend className="mb-2 text-base font-semibold text-sea">Alarm limits</legend>
          <div className="grid gap-x-6 gap-y-1 sm:grid-cols-2">{LIMIT_FIELDS.map(number)}</div>
        </fieldset>
        <fieldset className="min-w-0">
          <legend className="mb-2 text-base font-semibold text-sea">Patient</legend>
          <div className="grid gap-x-6 gap-y-1 sm:grid-cols-2">
            {PATIENT_FIELDS.map(number)}
            <SelectField
              id={fieldId(EFFORT_KIND_PATH)}
              label="Patient effort"
              hint="The patient's own breathing, on their own clock."
              errors={errorsFor(EFFORT_KIND_PATH)}
              value={draft.effortKind}
              options={(["none", "steady", "erratic"] as const).map((k) => ({ value: k, label: EFFORT_LABELS[k] }))}
              onChange={(e) => {
                const effortKind = e.target.value as EffortKind;
                setDraft((d) => ({ ...d, effortKind }));
              }}
            />
            {draft.effortKind === "none" ? null : EFFORT_FIELDS.map(number)}
          </div>
        </fieldset>
      </div>
      <div className="mt-2 flex flex-wrap items-center gap-3 border-t border-rule pt-4">
        <button type="submit" className={buttonClass("primary")}>
          Apply settings
        </button>
        <p role="status" className="text-sm">
          {dirty ? <span className="font-semibold text-ink">You have changes not applied yet.</span> : <span className="text-muted">{note}</span>}
        </p>
      </div>
    </form>
  );
}
