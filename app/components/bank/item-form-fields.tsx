/**
 * The item form's fields, shown by type: options and the key for choice items, answer, unit,
 * tolerance and decimals for numeric, steps for ordering, the bench run and the correct window
 * (drawn by clicking the waveform) for waveform point, the bench template and preview seeds
 * for scenario items. Drawn only with the shared field components.
 */
import type { FieldMetadata } from "@conform-to/react";
import { useMemo, useState } from "react";
import { WaveformPlot } from "~/components/waveform";
import { FormErrors, SelectField, TextAreaField, TextField, fromConform } from "~/components/ui/field";
import { generateScenarioItem, SCENARIO_TEMPLATES, simulate, TEMPLATE_IDS, type TemplateId } from "~/domain/bench";
import { placeholderNames } from "~/domain/bank/present";
import { canNarrow } from "~/domain/bank/scenario-ranges";
import { presetById, WAVEFORM_PRESETS } from "~/domain/bank/waveform-presets";
import { FORM_KIND_LABELS, FORM_KINDS, type FormKind } from "~/routes/bank/item-form";

type F = FieldMetadata<string | string[] | undefined>;
export type ItemFields = Record<
  | "kind" | "stem" | "topics" | "rationale" | "reference" | "options" | "correct" | "answer" | "unit" | "tolerance" | "decimals" | "steps"
  | "preset" | "viewFromS" | "viewToS" | "windowFromS" | "windowToS" | "templateId" | "previewSeeds",
  F
> & { range: FieldMetadata<Record<string, { min?: string; max?: string }> | undefined> };

const str = (f: F) => (typeof f.initialValue === "string" ? f.initialValue : undefined);

export function ItemFormFields({ fields, topics }: { fields: ItemFields; topics: { slug: string; name: string }[] }) {
  const [kind, setKind] = useState<FormKind>((str(fields.kind) as FormKind) ?? "single");
  const initialTopics = Array.isArray(fields.topics.initialValue) ? (fields.topics.initialValue as string[]) : str(fields.topics) ? [str(fields.topics)!] : [];
  return (
    <>
      <SelectField
        key={fields.kind.key}
        {...fromConform(fields.kind, { keepValue: false })}
        label="Type"
        defaultValue={kind}
        onChange={(e) => setKind(e.target.value as FormKind)}
        options={FORM_KINDS.map((k) => ({ value: k, label: FORM_KIND_LABELS[k] }))}
        className="flex max-w-md flex-col gap-1"
      />
      <TextAreaField
        key={fields.stem.key}
        {...fromConform(fields.stem, { keepValue: false })}
        label="Stem"
        hint={kind === "scenario" ? "Use {names} for the drawn values (listed with the template below); {prompt} inserts the template's own question." : "The question as the therapist reads it."}
        defaultValue={str(fields.stem)}
        rows={4}
      />
      <SelectField
        key={fields.topics.key}
        {...fromConform(fields.topics, { keepValue: false })}
        label="Topics"
        hint="Hold Ctrl (or ⌘) to choose more than one."
        multiple
        size={Math.min(8, topics.length)}
        defaultValue={initialTopics}
        options={topics.map((t) => ({ value: t.slug, label: t.name }))}
        className="flex max-w-md flex-col gap-1"
      />
      {kind === "single" || kind === "multiple" ? (
        <div className="grid gap-x-4 md:grid-cols-[2fr_1fr]">
          <TextAreaField key={fields.options.key} id={fields.options.id} name={fields.options.name} label="Options" hint="One option per line, two to eight." defaultValue={str(fields.options)} errors={fields.options.errors} rows={6} />
          <TextField
            key={fields.correct.key}
            {...fromConform(fields.correct, { keepValue: false })}
            label={kind === "single" ? "Correct option" : "Correct options"}
            hint={kind === "single" ? "Its line number, like 2." : "Their line numbers, like 1, 3."}
            defaultValue={str(fields.correct)}
          />
        </div>
      ) : null}
      {kind === "numeric" ? (
        <div className="grid gap-x-4 md:grid-cols-4">
          <TextField key={fields.answer.key} id={fields.answer.id} name={fields.answer.name} label="Correct answer" inputMode="decimal" defaultValue={str(fields.answer)} errors={fields.answer.errors} />
          <TextField key={fields.unit.key} id={fields.unit.id} name={fields.unit.name} label="Unit" hint="Like mL/cmH2O" defaultValue={str(fields.unit)} errors={fields.unit.errors} />
          <TextField key={fields.tolerance.key} id={fields.tolerance.id} name={fields.tolerance.name} label="Tolerance (±)" inputMode="decimal" defaultValue={str(fields.tolerance) ?? "0"} errors={fields.tolerance.errors} />
          <TextField key={fields.decimals.key} id={fields.decimals.id} name={fields.decimals.name} label="Decimals expected" inputMode="numeric" defaultValue={str(fields.decimals) ?? "0"} errors={fields.decimals.errors} />
        </div>
      ) : null}
      {kind === "ordering" ? (
        <TextAreaField key={fields.steps.key} id={fields.steps.id} name={fields.steps.name} label="Steps, in the correct order" hint="One step per line, three to eight; the therapist sees them shuffled." defaultValue={str(fields.steps)} errors={fields.steps.errors} rows={7} />
      ) : null}
      {kind === "waveform-point" ? <WaveformFields fields={fields} /> : null}
      {kind === "scenario" ? <ScenarioFields fields={fields} /> : null}
      <TextAreaField key={fields.rationale.key} id={fields.rationale.id} name={fields.rationale.name} label="Rationale" hint="Shown to the therapist after grading." defaultValue={str(fields.rationale)} errors={fields.rationale.errors} rows={4} />
      <TextField
        key={fields.reference.key}
        {...fromConform(fields.reference, { keepValue: false })}
        label="Reference"
        hint="A textbook, guideline, standard or paper: authors, title, year."
        defaultValue={str(fields.reference)}
      />
    </>
  );
}

function WaveformFields({ fields }: { fields: ItemFields }) {
  const [presetId, setPresetId] = useState(str(fields.preset) ?? WAVEFORM_PRESETS[0].id);
  const preset = presetById(presetId) ?? WAVEFORM_PRESETS[0];
  const [viewTo, setViewTo] = useState(str(fields.viewToS) ?? String(preset.viewToS));
  const [from, setFrom] = useState(str(fields.windowFromS) ?? "");
  const [to, setTo] = useState(str(fields.windowToS) ?? "");
  const [next, setNext] = useState<"from" | "to">("from");
  const run = useMemo(() => simulate(preset.bench), [preset]);
  const end = Number(viewTo) > 0 ? Number(viewTo) : preset.viewToS;
  const a = Number(from);
  const b = Number(to);
  const windows = from !== "" && to !== "" && b > a ? [{ fromS: a, toS: b, label: "Correct window" }] : [];
  return (
    <div className="flex flex-col gap-2 rounded-md border border-rule p-3">
      <SelectField
        key={fields.preset.key}
        {...fromConform(fields.preset, { keepValue: false })}
        label="Bench run"
        value={presetId}
        onChange={(e) => setPresetId(e.target.value)}
        options={WAVEFORM_PRESETS.map((p) => ({ value: p.id, label: p.label }))}
      />
      <input type="hidden" name={fields.viewFromS.name} value="0" />
      <TextField key={fields.viewToS.key} id={fields.viewToS.id} name={fields.viewToS.name} label="Show the run up to (s)" inputMode="decimal" value={viewTo} onChange={(e) => setViewTo(e.target.value)} errors={fields.viewToS.errors} className="flex max-w-xs flex-col gap-1" />
      <p className="text-sm text-muted">Draw the correct window: click its start on the waveform, then its end (or type the times).</p>
      <WaveformPlot
        waveform={run.waveform}
        breaths={run.breaths}
        startS={0}
        endS={Math.min(end, run.breaths.at(-1)!.startS + run.breaths.at(-1)!.durationS)}
        windows={windows}
        showTable={false}
        onPointClick={(t) => {
          const v = t.toFixed(2);
          if (next === "from") {
            setFrom(v);
            setNext("to");
          } else {
            if (Number(v) > Number(from)) setTo(v);
            else {
              setTo(from);
              setFrom(v);
            }
            setNext("from");
          }
        }}
      />
      <div className="grid gap-x-4 md:grid-cols-2">
        <TextField key={fields.windowFromS.key} id={fields.windowFromS.id} name={fields.windowFromS.name} label="Correct window from (s)" inputMode="decimal" value={from} onChange={(e) => setFrom(e.target.value)} errors={fields.windowFromS.errors} />
        <TextField key={fields.windowToS.key} id={fields.windowToS.id} name={fields.windowToS.name} label="Correct window to (s)" inputMode="decimal" value={to} onChange={(e) => setTo(e.target.value)} errors={fields.windowToS.errors} />
      </div>
    </div>
  );
}

function ScenarioFields({ fields }: { fields: ItemFields }) {
  const [templateId, setTemplateId] = useState<TemplateId>((str(fields.templateId) as TemplateId) || TEMPLATE_IDS[0]);
  const template = SCENARIO_TEMPLATES[templateId] ?? SCENARIO_TEMPLATES[TEMPLATE_IDS[0]];
  const names = useMemo(() => placeholderNames(generateScenarioItem(templateId, 1)), [templateId]);
  return (
    <div className="flex flex-col gap-2 rounded-md border border-rule p-3">
      <SelectField
        key={fields.templateId.key}
        {...fromConform(fields.templateId, { keepValue: false })}
        label="Bench template"
        value={templateId}
        onChange={(e) => setTemplateId(e.target.value as TemplateId)}
        options={TEMPLATE_IDS.map((id) => ({ value: id, label: SCENARIO_TEMPLATES[id].title }))}
      />
      <p className="text-sm">
        <span className="font-semibold">Placeholders: </span>
        {names.map((n) => `{${n}}`).join(", ")}
      </p>
      {canNarrow(templateId) ? (
        <fieldset className="flex flex-col gap-1">
          <legend className="font-semibold">Parameter ranges</legend>
          <p className="text-sm text-muted">The bench draws each value on its step grid between these ends. Narrow them if you need to; leave them to use the template's own.</p>
          <FormErrors id={`${fields.range.id}-errors`} errors={fields.range.errors} />
          <div className="grid gap-x-4 md:grid-cols-2">
            {Object.entries(template.parameterRanges).map(([k, r]) => {
              const initial = (fields.range.initialValue as Record<string, { min?: string; max?: string }> | undefined)?.[k];
              const errors = (fields.range.getFieldset() as Record<string, FieldMetadata<unknown>>)[k]?.errors;
              return (
                <div key={`${templateId}-${k}`} className="grid grid-cols-2 gap-x-2">
                  <TextField id={`range-${k}-min`} name={`${fields.range.name}.${k}.min`} label={`${k} from`} hint={`${r.unit}, step ${r.step}`} inputMode="decimal" defaultValue={initial?.min ?? String(r.min)} errors={errors} />
                  <TextField id={`range-${k}-max`} name={`${fields.range.name}.${k}.max`} label={`${k} to`} hint={`template: ${r.min}–${r.max}`} inputMode="decimal" defaultValue={initial?.max ?? String(r.max)} />
                </div>
              );
            })}
          </div>
        </fieldset>
      ) : (
        <details>
          <summary className="cursor-pointer font-semibold text-sea">Parameter ranges the bench draws from</summary>
          <p className="mt-1 text-sm text-muted">This template draws several situations; its ranges are fixed.</p>
          <ul className="mt-1 text-sm">
            {Object.entries(template.parameterRanges).map(([k, r]) => (
              <li key={k}>
                {k}: {r.min}–{r.max} {r.unit} in steps of {r.step}
              </li>
            ))}
          </ul>
        </details>
      )}
      <TextField
        key={fields.previewSeeds.key}
        {...fromConform(fields.previewSeeds, { keepValue: false })}
        label="Preview seeds"
        hint="One to six whole numbers, like 1, 2, 3: each draws its own numbers; the answer is computed by the bench."
        defaultValue={str(fields.previewSeeds) ?? "1, 2, 3"}
      />
    </div>
  );
}
