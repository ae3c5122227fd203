/**
 * The exam form and the assign form: one zod schema each, shared by conform in the browser and
 * the actions. The exam form's fields are flat text (a number per topic, three percents, dates);
 * the schema turns them into an exam version's settings and its blueprint, holds the blueprint
 * to the same rules as the seed (app/domain/exams/blueprint.ts), and reports each problem on the
 * field that caused it.
 */
import { z } from "zod";
import { ROLES, type Role } from "~/auth/roles";
import { TOPIC_SLUGS } from "~/domain/bank/item-content";
import { blueprintSchema, DIFFICULTY_BANDS, type Blueprint } from "~/domain/exams/blueprint";
import { isIsoDate, type IsoDate } from "~/domain/status/calendar-date";

export const REVIEW_POLICY_LABELS = {
  "score-only": "Score only",
  "score-and-topics": "Score and topic subscores",
  "full-rationale": "Full rationale for every item",
} as const;
export type ReviewPolicy = keyof typeof REVIEW_POLICY_LABELS;
export const REVIEW_POLICY_LIST = Object.keys(REVIEW_POLICY_LABELS) as ReviewPolicy[];

export const MULTIPLE_RESPONSE_LABELS = {
  "all-or-nothing": "All or nothing: the point only when every choice is right",
  partial: "Partial credit for each right choice",
} as const;
export type MultipleResponseScoring = keyof typeof MULTIPLE_RESPONSE_LABELS;

export const ORDERING_LABELS = {
  exact: "Exact order only",
  partial: "Partial credit for steps in the right place",
} as const;
export type OrderingScoring = keyof typeof ORDERING_LABELS;

/** Limits of the form (common practice, no source): a shift-length sitting at most, up to ten tries. */
export const MAX_TIME_LIMIT_MINUTES = 480;
export const MAX_ATTEMPTS = 10;

/** One exam version's settings, as saved. */
export type ExamSettings = {
  title: string;
  description: string | null;
  blueprint: Blueprint;
  timeLimitMinutes: number | null;
  passMarkPercent: number;
  attemptsAllowed: number;
  shuffleItems: boolean;
  shuffleOptions: boolean;
  reviewPolicy: ReviewPolicy;
  multipleResponseScoring: MultipleResponseScoring;
  orderingScoring: OrderingScoring;
  availableFrom: IsoDate | null;
  availableUntil: IsoDate | null;
};

const blank = (v: string | undefined) => (v ?? "").trim() === "";

/**
 * `publishedItemIds`: on the server, the organisation's published items, so a fixed item that is
 * not one of them is refused on its field (the browser has no such list and skips the check).
 */
export function examFormSchema(check: { publishedItemIds?: ReadonlySet<string> } = {}) {
  return z
    .object({
      // Every field is optional text here so that all problems are reported at once below
      // (a failed field would stop the transform); an empty field arrives as undefined.
      title: z.string().optional(),
      description: z.string().optional(),
      /** `topics.<slug>`: how many items of that topic. */
      topics: z.record(z.string(), z.string().optional()).optional(),
      /** `difficulty.easy` … percents; all blank = no mix. */
      difficulty: z.record(z.string(), z.string().optional()).optional(),
      fixed: z.preprocess((v) => (v === undefined ? [] : typeof v === "string" ? [v] : v), z.array(z.string().min(1))),
      timeLimitMinutes: z.string().optional(),
      passMarkPercent: z.string().optional(),
      attemptsAllowed: z.string().optional(),
      shuffleItems: z.string().optional(),
      shuffleOptions: z.string().optional(),
      reviewPolicy: z.string().optional(),
      multipleResponseScoring: z.string().optional(),
      orderingScoring: z.string().optional(),
      availableFrom: z.string().optional(),
      availableUntil: z.string().optional(),
    })
    .transform((f, ctx): ExamSettings => {
      const reported = new Set<string>();
      const fail = (path: string, message: string) => {
        if (!reported.has(path)) ctx.addIssue({ code: "custom", path: path.split("."), message });
        reported.add(path);
      };
      const title = (f.title ?? "").trim();
      if (!title) fail("title", "Give the exam a title.");
      else if (title.length > 200) fail("title", "Keep the title under 200 characters.");
      if ((f.description ?? "").length > 2000) fail("description", "Keep the description under 2,000 characters.");
      const oneOf = <T extends string>(path: string, v: string | undefined, allowed: readonly T[], message: string): T => {
        if (!(allowed as readonly string[]).includes(v ?? "")) fail(path, message);
        return v as T;
      };
      const reviewPolicy = oneOf("reviewPolicy", f.reviewPolicy, REVIEW_POLICY_LIST, "Choose what the therapist sees after submitting.");
      const multipleResponseScoring = oneOf("multipleResponseScoring", f.multipleResponseScoring, Object.keys(MULTIPLE_RESPONSE_LABELS) as MultipleResponseScoring[], "Choose how multiple-response items are scored.");
      const orderingScoring = oneOf("orderingScoring", f.orderingScoring, Object.keys(ORDERING_LABELS) as OrderingScoring[], "Choose how ordering items are scored.");
      const whole = (path: string, v: string | undefined, min: number, max: number, message: string): number | null => {
        if (blank(v)) return null;
        const n = Number(v!.trim());
        if (!Number.isInteger(n) || n < min || n > max) {
          fail(path, message);
          return null;
        }
        return n;
      };

      const topics: Record<string, number> = {};
      for (const [slug, raw] of Object.entries(f.topics ?? {})) {
        if (!(TOPIC_SLUGS as readonly string[]).includes(slug)) {
          fail(`topics.${slug}`, "Unknown topic.");
          continue;
        }
        const n = whole(`topics.${slug}`, raw, 0, 100, "Enter a whole number of items from 0 to 100.");
        if (n) topics[slug] = n;
      }

      let difficulty: Blueprint["difficulty"];
      const mix = f.difficulty ?? {};
      if (DIFFICULTY_BANDS.some((b) => !blank(mix[b]))) {
        const share = Object.fromEntries(DIFFICULTY_BANDS.map((b) => [b, blank(mix[b]) ? 0 : whole(`difficulty.${b}`, mix[b], 0, 100, "Enter a whole percent from 0 to 100.")])) as Record<
          (typeof DIFFICULTY_BANDS)[number],
          number | null
        >;
        if (DIFFICULTY_BANDS.every((b) => share[b] !== null)) {
          const sum = share.easy! + share.medium! + share.hard!;
          if (sum !== 100) fail("difficulty", `The difficulty mix must add up to 100 % (it adds up to ${sum} %). Leave all three blank for no mix.`);
          else difficulty = { easy: share.easy!, medium: share.medium!, hard: share.hard! };
        }
      }

      const fixed = [...new Set(f.fixed)];
      if (check.publishedItemIds) {
        const unknown = fixed.filter((id) => !check.publishedItemIds!.has(id));
        if (unknown.length) fail("fixed", `${unknown.length === 1 ? "One fixed item is" : `${unknown.length} fixed items are`} not a published item of your bank. Choose from the list.`);
      }

      const timeLimitMinutes = whole("timeLimitMinutes", f.timeLimitMinutes, 1, MAX_TIME_LIMIT_MINUTES, `Enter whole minutes from 1 to ${MAX_TIME_LIMIT_MINUTES}, or leave it blank for an untimed exam.`);

      let passMarkPercent = 0;
      const pass = Number((f.passMarkPercent ?? "").trim());
      if (blank(f.passMarkPercent)) fail("passMarkPercent", "Enter the pass mark, from 1 to 100 %.");
      else if (!Number.isFinite(pass) || pass < 1 || pass > 100) fail("passMarkPercent", "The pass mark must be from 1 to 100 %.");
      else passMarkPercent = pass;

      let attemptsAllowed = 0;
      if (blank(f.attemptsAllowed)) fail("attemptsAllowed", `Enter how many attempts a person may make, from 1 to ${MAX_ATTEMPTS}.`);
      else attemptsAllowed = whole("attemptsAllowed", f.attemptsAllowed, 1, MAX_ATTEMPTS, `Attempts allowed must be a whole number from 1 to ${MAX_ATTEMPTS}.`) ?? 0;

      const date = (path: string, v: string | undefined): IsoDate | null => {
        if (blank(v)) return null;
        if (!isIsoDate(v!.trim())) {
          fail(path, "Enter a date like 2027-01-31.");
          return null;
        }
        return v!.trim();
      };
      const availableFrom = date("availableFrom", f.availableFrom);
      const availableUntil = date("availableUntil", f.availableUntil);
      if (availableFrom && availableUntil && availableUntil < availableFrom) fail("availableUntil", "The window must close on or after the day it opens.");

      const blueprint = { topics, ...(difficulty ? { difficulty } : {}), ...(fixed.length ? { fixed } : {}) };
      const checked = blueprintSchema.safeParse(blueprint);
      if (!checked.success) {
        for (const issue of checked.error.issues) {
          const top = String(issue.path[0] ?? "topics");
          fail(top === "difficulty" || top === "fixed" ? top : "topics", issue.message);
        }
      }
      if (reported.size > 0 || !checked.success) return z.NEVER;
      return {
        title,
        description: blank(f.description) ? null : f.description!.trim(),
        blueprint: checked.data,
        timeLimitMinutes,
        passMarkPercent,
        attemptsAllowed,
        shuffleItems: f.shuffleItems === "on",
        shuffleOptions: f.shuffleOptions === "on",
        reviewPolicy,
        multipleResponseScoring,
        orderingScoring,
        availableFrom,
        availableUntil,
      };
    });
}

/** The form's starting values for an existing version (or the defaults of a new exam). */
export type ExamFormValues = Record<string, string | string[] | Record<string, string> | undefined>;
export function examFormValues(v: ExamSettings): ExamFormValues {
  return {
    title: v.title,
    description: v.description ?? "",
    topics: Object.fromEntries(Object.entries(v.blueprint.topics).map(([k, n]) => [k, String(n)])),
    difficulty: v.blueprint.difficulty ? Object.fromEntries(DIFFICULTY_BANDS.map((b) => [b, String(v.blueprint.difficulty![b])])) : {},
    fixed: v.blueprint.fixed ?? [],
    timeLimitMinutes: v.timeLimitMinutes === null ? "" : String(v.timeLimitMinutes),
    passMarkPercent: String(v.passMarkPercent),
    attemptsAllowed: String(v.attemptsAllowed),
    shuffleItems: v.shuffleItems ? "on" : undefined,
    shuffleOptions: v.shuffleOptions ? "on" : undefined,
    reviewPolicy: v.reviewPolicy,
    multipleResponseScoring: v.multipleResponseScoring,
    orderingScoring: v.orderingScoring,
    availableFrom: v.availableFrom ?? "",
    availableUntil: v.availableUntil ?? "",
  };
}

export const NEW_EXAM_DEFAULTS = examFormValues({
  title: "",
  description: null,
  blueprint: { topics: {} },
  timeLimitMinutes: 30,
  passMarkPercent: 80,
  attemptsAllowed: 2,
  shuffleItems: true,
  shuffleOptions: true,
  reviewPolicy: "score-and-topics",
  multipleResponseScoring: "all-or-nothing",
  orderingScoring: "exact",
  availableFrom: null,
  availableUntil: null,
});

/** Roles an exam may be assigned to (an admin does not take exams: PRODUCT.md section table). */
export const ASSIGNABLE_ROLES = ROLES.filter((r) => r !== "admin") as Exclude<Role, "admin">[];
export const ASSIGN_TARGETS = ["people", "unit", "role"] as const;
export type AssignTarget = { kind: "people"; personIds: string[] } | { kind: "unit"; unitId: string } | { kind: "role"; role: Exclude<Role, "admin"> };

/** The assign panel; `today` is the organisation's calendar date (a due date may not be earlier). */
export function assignFormSchema(today: IsoDate) {
  return z
    .object({
      intent: z.string().optional(),
      to: z.enum(ASSIGN_TARGETS, { error: "Choose whom to assign: people, a unit or a role." }),
      personIds: z.preprocess((v) => (v === undefined ? [] : typeof v === "string" ? [v] : v), z.array(z.string().min(1))),
      unitId: z.string().optional(),
      role: z.string().optional(),
      dueOn: z.string({ error: "Enter the due date." }).trim(),
    })
    .transform((f, ctx): { target: AssignTarget; dueOn: IsoDate } => {
      let target: AssignTarget | null = null;
      if (f.to === "people") {
        if (f.personIds.length === 0) ctx.addIssue({ code: "custom", path: ["personIds"], message: "Choose at least one person." });
        else if (f.personIds.length > 500) ctx.addIssue({ code: "custom", path: ["personIds"], message: "Choose at most 500 people at once." });
        else target = { kind: "people", personIds: [...new Set(f.personIds)] };
      } else if (f.to === "unit") {
        if (blank(f.unitId)) ctx.addIssue({ code: "custom", path: ["unitId"], message: "Choose a unit." });
        else target = { kind: "unit", unitId: f.unitId! };
      } else {
        if (!(ASSIGNABLE_ROLES as string[]).includes(f.role ?? "")) ctx.addIssue({ code: "custom", path: ["role"], message: "Choose a role." });
        else target = { kind: "role", role: f.role as Exclude<Role, "admin"> };
      }
      if (!isIsoDate(f.dueOn)) ctx.addIssue({ code: "custom", path: ["dueOn"], message: "Enter the due date, like 2027-01-31." });
      else if (f.dueOn < today) ctx.addIssue({ code: "custom", path: ["dueOn"], message: `The due date must be today (${today}) or later.` });
      if (!target || !isIsoDate(f.dueOn) || f.dueOn < today) return z.NEVER;
      return { target, dueOn: f.dueOn };
    });
}
