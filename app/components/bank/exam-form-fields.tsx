import type { FieldMetadata } from "@conform-to/react";
import { fromConform, SelectField, TextAreaField, TextField } from "~/components/ui/field";
import { DIFFICULTY_BANDS } from "~/domain/exams/blueprint";
import {
  MAX_ATTEMPTS,
  MAX_TIME_LIMIT_MINUTES,
  MULTIPLE_RESPONSE_LABELS,
  ORDERING_LABELS,
  REVIEW_POLICY_LABELS,
  REVIEW_POLICY_LIST,
} from "~/routes/bank/exam-form";

type F = FieldMetadata<unknown>;
export type ExamFields = Record<
  | "title"
  | "description"
  | "fixed"
  | "timeLimitMinutes"
  | "passMarkPercent"
  | "attemptsAllowed"
  | "shuffleItems"
  | "shuffleOptions"
  | "reviewPolicy"
  | "multipleResponseScoring"
  | "orderingScoring"
  | "availableFrom"
  | "availableUntil",
  F
> & { topics: FieldMetadata<Record<string, string | undefined> | undefined>; difficulty: FieldMetadata<Record<string, string | undefined> | undefined> };

/** A topic of the organisation with how many published items the bank holds for it. */
export type TopicSupply = { slug: string; name: string; published: number };
export type PickerItem = { itemId: string; stem: string; topics: readonly string[] };

const str = (f: F) => (typeof f.initialValue === "string" ? f.initialValue : undefined);
const BAND_WORDS = { easy: "Easy", medium: "Medium", hard: "Hard" } as const;

/** The exam form's fields, shared by "Write an exam" and "Edit exam". */
export function ExamFormFields({ fields, topics, items }: { fields: ExamFields; topics: TopicSupply[]; items: PickerItem[] }) {
  const topicInitial = (fields.topics.initialValue ?? {}) as Record<string, string | undefined>;
  const topicErrors = fields.topics.getFieldset() as Record<string, F>;
  const mixInitial = (fields.difficulty.initialValue ?? {}) as Record<string, string | undefined>;
  const mixErrors = fields.difficulty.getFieldset() as Record<string, F>;
  const fixedInitial = new Set(Array.isArray(fields.fixed.initialValue) ? (fields.fixed.initialValue as string[]) : str(fields.fixed) ? [str(fields.fixed)!] : []);
  const topicName = new Map(topics.map((t) => [t.slug, t.name]));
  const checked = (f: F) => f.initialValue === "on";
  return (
    <>
      <TextField key={fields.title.key} {...fromConform(fields.title)} label="Title" maxLength={200} />
      <TextAreaField key={fields.description.key} {...fromConform(fields.description)} label="Description" hint="What the exam covers, as the therapist reads it on the start page." rows={3} />

      <fieldset className="flex flex-col gap-2 rounded-md border border-rule p-4" aria-describedby={`${fields.topics.id}-hint`}>
        <legend className="px-1 font-semibold">Blueprint: items per topic</legend>
        <p id={`${fields.topics.id}-hint`} className="text-sm text-muted">
          How many items each attempt draws from each topic. Leave a topic blank or 0 to leave it out. The bank's published items are counted beside each topic; an item tagged with two topics is drawn for one only.
        </p>
        <div className="min-h-6 text-sm text-coral" id={`${fields.topics.id}-error`} aria-live="polite">
          {fields.topics.errors?.length ? (
            <ul>
              {fields.topics.errors.map((e) => (
                <li key={e}>{e}</li>
              ))}
            </ul>
          ) : null}
        </div>
        <div className="grid gap-x-4 sm:grid-cols-2 lg:grid-cols-4">
          {topics.map((t) => {
            const asked = Number(topicInitial[t.slug] ?? 0);
            return (
              <TextField
                key={t.slug}
                id={`${fields.topics.id}-${t.slug}`}
                name={`${fields.topics.name}.${t.slug}`}
                label={t.name}
                hint={
                  <>
                    {t.published} published {t.published === 1 ? "item" : "items"}
                    {Number.isFinite(asked) && asked > t.published ? <span className="font-semibold text-coral"> — fewer than asked</span> : null}
                  </>
                }
                inputMode="numeric"
                defaultValue={topicInitial[t.slug] ?? ""}
                errors={topicErrors[t.slug]?.errors}
              />
            );
          })}
        </div>
      </fieldset>

      <fieldset className="flex flex-col gap-2 rounded-md border border-rule p-4">
        <legend className="px-1 font-semibold">Difficulty mix (optional)</legend>
        <p className="text-sm text-muted">
          Percent of each topic's items drawn from each band; the three add up to 100. Leave all three blank to draw from any band. An item's band comes from how many answered it right once twenty people have; until then it counts as medium.
        </p>
        <div className="min-h-6 text-sm text-coral" id={`${fields.difficulty.id}-error`} aria-live="polite">
          {fields.difficulty.errors?.length ? (
            <ul>
              {fields.difficulty.errors.map((e) => (
                <li key={e}>{e}</li>
              ))}
            </ul>
          ) : null}
        </div>
        <div className="grid max-w-xl gap-x-4 sm:grid-cols-3">
          {DIFFICULTY_BANDS.map((b) => (
            <TextField
              key={b}
              id={`${fields.difficulty.id}-${b}`}
              name={`${fields.difficulty.name}.${b}`}
              label={`${BAND_WORDS[b]} (%)`}
              inputMode="numeric"
              defaultValue={mixInitial[b] ?? ""}
              errors={mixErrors[b]?.errors}
            />
          ))}
        </div>
      </fieldset>

      <details className="rounded-md border border-rule p-4" open={fixedInitial.size > 0 || !!fields.fixed.errors?.length}>
        <summary className="cursor-pointer font-semibold text-sea">Fixed items: asked in every attempt ({fixedInitial.size} chosen)</summary>
        <p className="mt-1 text-sm text-muted">Each fixed item takes one place of its first topic in the blueprint; the rest of the places are drawn.</p>
        <div className="min-h-6 text-sm text-coral" id={`${fields.fixed.id}-error`} aria-live="polite">
          {fields.fixed.errors?.length ? (
            <ul>
              {fields.fixed.errors.map((e) => (
                <li key={e}>{e}</li>
              ))}
            </ul>
          ) : null}
        </div>
        {items.length === 0 ? <p className="text-muted">The bank has no published items yet.</p> : null}
        {topics
          .filter((t) => items.some((i) => i.topics[0] === t.slug))
          .map((t) => (
            <fieldset key={t.slug} className="mt-3">
              <legend className="font-semibold">{t.name}</legend>
              <ul className="mt-1 flex flex-col gap-1">
                {items
                  .filter((i) => i.topics[0] === t.slug)
                  .map((i) => (
                    <li key={i.itemId}>
                      <label className="flex items-start gap-2">
                        <input type="checkbox" name={fields.fixed.name} value={i.itemId} defaultChecked={fixedInitial.has(i.itemId)} className="mt-1 h-5 w-5 shrink-0" />
                        <span>
                          {i.stem}
                          {i.topics.length > 1 ? <span className="block text-sm text-muted">Also: {i.topics.slice(1).map((s) => topicName.get(s) ?? s).join(", ")}</span> : null}
                        </span>
                      </label>
                    </li>
                  ))}
              </ul>
            </fieldset>
          ))}
      </details>

      <div className="grid gap-x-4 md:grid-cols-3">
        <TextField
          key={fields.timeLimitMinutes.key}
          {...fromConform(fields.timeLimitMinutes)}
          label="Time limit (minutes)"
          hint={`Blank for an untimed exam; at most ${MAX_TIME_LIMIT_MINUTES}.`}
          inputMode="numeric"
        />
        <TextField key={fields.passMarkPercent.key} {...fromConform(fields.passMarkPercent)} label="Pass mark (%)" hint="From 1 to 100." inputMode="decimal" />
        <TextField key={fields.attemptsAllowed.key} {...fromConform(fields.attemptsAllowed)} label="Attempts allowed" hint={`From 1 to ${MAX_ATTEMPTS}, per person.`} inputMode="numeric" />
      </div>

      <fieldset className="flex flex-col gap-2">
        <legend className="font-semibold">Shuffling</legend>
        <label className="flex items-center gap-2">
          <input type="checkbox" name={fields.shuffleItems.name} id={fields.shuffleItems.id} defaultChecked={checked(fields.shuffleItems)} className="h-5 w-5" />
          Shuffle the order of the items
        </label>
        <label className="flex items-center gap-2">
          <input type="checkbox" name={fields.shuffleOptions.name} id={fields.shuffleOptions.id} defaultChecked={checked(fields.shuffleOptions)} className="h-5 w-5" />
          Shuffle the options within each item
        </label>
      </fieldset>

      <div className="mt-2 grid gap-x-4 md:grid-cols-3">
        <SelectField
          key={fields.reviewPolicy.key}
          {...fromConform(fields.reviewPolicy)}
          label="After submitting, the therapist sees"
          options={REVIEW_POLICY_LIST.map((p) => ({ value: p, label: REVIEW_POLICY_LABELS[p] }))}
        />
        <SelectField
          key={fields.multipleResponseScoring.key}
          {...fromConform(fields.multipleResponseScoring)}
          label="Multiple-response items"
          options={Object.entries(MULTIPLE_RESPONSE_LABELS).map(([value, label]) => ({ value, label }))}
        />
        <SelectField key={fields.orderingScoring.key} {...fromConform(fields.orderingScoring)} label="Ordering items" options={Object.entries(ORDERING_LABELS).map(([value, label]) => ({ value, label }))} />
      </div>

      <div className="grid max-w-xl gap-x-4 sm:grid-cols-2">
        <TextField key={fields.availableFrom.key} {...fromConform(fields.availableFrom)} type="date" label="Available from" hint="Blank: as soon as it is published." />
        <TextField key={fields.availableUntil.key} {...fromConform(fields.availableUntil)} type="date" label="Available until" hint="Blank: no closing day." />
      </div>
    </>
  );
}

