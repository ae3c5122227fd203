/**
 * The autosave bench (tests/bench/autosave.ts) is only worth its numbers if what it sends is what
 * a therapist's page could send and the server accepts: its exam must be publishable from the
 * seeded bank, every answer it makes for a drawn question must be saved (not refused with a 422,
 * which would count as an error and hide the save path being measured), and a scaled run must be
 * reported as scaled. Checked here against the real service code on a seeded database; no
 * outside computation is involved.
 */
import { and, asc, eq, ne } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import type { Database } from "~/db/client.server";
import { answeredCount, checkAnswer, saveAnswer, startAttempt, type FormShape, type StoredFormEntry } from "~/db/queries/exam-attempts.server";
import { createExam, publishExam } from "~/db/queries/exams-authoring.server";
import { attempts, people, personRoles } from "~/db/schema";
import { answerFor, AUTOSAVE_DEFAULTS, autosaveSettings, BENCH_EXAM_QUESTIONS, benchExamSettings, savesPerExaminee } from "../bench/autosave";
import { useSeededDatabase } from "../setup/db";
import { viewerFor } from "../setup/request";

let db: Database;
let educator: Viewer;
let therapists: Viewer[] = [];

beforeAll(async () => {
  db = await useSeededDatabase();
  educator = await viewerFor("educator@kestrelvalley.test");
  const rows = await db.db
    .select({ email: people.email })
    .from(people)
    .innerJoin(personRoles, eq(personRoles.personId, people.id))
    .where(and(eq(personRoles.role, "therapist"), eq(people.orgId, educator.org.id), eq(people.active, true), ne(people.email, "therapist@kestrelvalley.test")))
    .orderBy(asc(people.email));
  therapists = await Promise.all(rows.slice(0, 4).map((r) => viewerFor(r.email)));
});

describe("the bench exam and the answers the bench sends", () => {
  it("is published from the seeded bank, and every answer made for a drawn question is saved", async () => {
    const now = new Date();
    const examId = await createExam(educator.org.id, educator.person.id, benchExamSettings(), now);
    const published = await publishExam(educator.org.id, educator.person.id, examId, now);
    expect(published).toEqual({ ok: true, version: 1, restored: false });

    const kinds = new Set<string>();
    // Four therapists, four seeds: four different draws of the 30 questions.
    for (const [i, t] of therapists.entries()) {
      const who = { orgId: t.org.id, personId: t.person.id, timeZone: t.org.timeZone };
      const started = await startAttempt(who, examId, "one", now, 1000 + i);
      if (!started.ok) throw new Error(started.message);
      const [row] = await db.db.select({ form: attempts.form }).from(attempts).where(eq(attempts.id, started.attemptId));
      const form = [...(row.form as StoredFormEntry[])].sort((a, b) => a.position - b.position);
      expect(form.map((f) => f.position)).toEqual(Array.from({ length: BENCH_EXAM_QUESTIONS }, (_, k) => k));
      for (const [k, entry] of form.entries()) {
        kinds.add(entry.shape.kind);
        const saved = await saveAnswer(who, started.attemptId, entry.position, { answer: answerFor(entry.shape, i + k) }, now);
        expect(saved, `position ${entry.position} (${entry.shape.kind})`).toMatchObject({ ok: true, position: entry.position });
      }
      expect(await answeredCount(db.db, started.attemptId)).toBe(BENCH_EXAM_QUESTIONS);
    }
    // The seeded bank is mostly single-choice and numeric items; both must be exercised.
    expect(kinds).toContain("single");
    expect(kinds).toContain("numeric");
  });

  it("makes an accepted answer for every kind of question, including kinds a draw may miss", () => {
    const shapes: FormShape[] = [
      { kind: "single", optionIds: [3, 1, 2] },
      { kind: "multiple", optionIds: [4, 2] },
      { kind: "ordering", stepIds: [2, 0, 1] },
      { kind: "numeric", unit: "mL/cmH2O" },
      { kind: "waveform-point", fromS: 2, toS: 6 },
    ];
    for (const shape of shapes) {
      for (const k of [0, 1, 5]) expect(checkAnswer(shape, answerFor(shape, k)), shape.kind).toMatchObject({ ok: true });
    }
    expect(answerFor({ kind: "waveform-point", fromS: 2, toS: 6 }, 0)).toEqual({ kind: "waveform-point", timeS: 4 });
  });
});

describe("the autosave settings", () => {
  it("defaults to issue 5's load: 300 examinees, one save every 5 s for 2 minutes, 24 saves each — within the 30 questions", () => {
    const s = autosaveSettings({}, {});
    expect(s).toEqual({ examinees: 300, seconds: 120, intervalS: 5, mode: "full", source: "defaults" });
    expect(savesPerExaminee(s)).toBe(24);
    expect(savesPerExaminee(s)).toBeLessThanOrEqual(BENCH_EXAM_QUESTIONS);
    expect(AUTOSAVE_DEFAULTS.examinees).toBe(300);
  });

  it("reports a shortened run as scaled and says where the setting came from; a flag wins over the variable", () => {
    expect(autosaveSettings({}, { AUTOSAVE_SECONDS: "30" })).toMatchObject({ seconds: 30, mode: "scaled", source: "AUTOSAVE_SECONDS=30" });
    expect(autosaveSettings({ seconds: "60" }, { AUTOSAVE_SECONDS: "30" })).toMatchObject({ seconds: 60, mode: "scaled", source: "--autosave-seconds 60" });
    expect(savesPerExaminee({ seconds: 30, intervalS: 5 })).toBe(6);
  });

  it("refuses a run that would save more answers than the exam has questions, and values that are not numbers", () => {
    expect(() => autosaveSettings({ seconds: "200" }, {})).toThrow("40 saves per examinee, more than the bench exam's 30 questions");
    expect(() => autosaveSettings({}, { AUTOSAVE_SECONDS: "soon" })).toThrow('--autosave-seconds (or AUTOSAVE_SECONDS) must be a number of at least 1, got "soon".');
    expect(() => autosaveSettings({ examinees: "2.5" }, {})).toThrow("--autosave-examinees must be a whole number, got 2.5.");
  });
});
