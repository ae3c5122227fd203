/**
 * Certificates (issue 9 §2) on a seeded copy of the demo database: a passed exam and a signed
 * competent check-off each become exactly one certificate, however often issuing runs; the PDF is
 * read back by an independent reader (poppler: pdftotext, pdfinfo, pdffonts, pdfimages) and its QR
 * code decoded by an independent decoder (jsqr) to the verification address; the public /verify
 * page shows valid, expired and revoked, and a bare 404 for an unknown code; only the holder and a
 * manager of their units see a certificate, and only the manager revokes (with a reason, audited).
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, asc, eq, ne } from "drizzle-orm";
import jsQR from "jsqr";
import { PNG } from "pngjs";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { env } from "~/config/env.server";
import type { Database } from "~/db/client.server";
import { verifyAuditChain } from "~/db/audit.server";
import { issuePendingCertificates } from "~/db/queries/certificates.server";
import { finishAttempt, saveAnswer, startAttempt, type StoredFormEntry, type SubmittedAnswer } from "~/db/queries/exam-attempts.server";
import { contentOf, topicsOf } from "~/db/queries/bank.server";
import { getCheckoffRecord } from "~/db/queries/checkoffs.server";
import { attempts, auditEvents, certificates, domainEvents, exams, itemVersions, organisations, people, personRoles, requirements } from "~/db/schema";
import { presentItem, type Key } from "~/domain/bank/present";
import { certificateCodeFrom, normaliseCertificateCode } from "~/domain/certificates/certificate";
import * as certificatePage from "~/routes/credentials/certificate";
import * as certificatePdf from "~/routes/credentials/certificate-pdf";
import * as credentialsPage from "~/routes/credentials/index";
import * as verifyPage from "~/routes/verify";
import { useSeededDatabase } from "../setup/db";
import { args, contextFor, getRequest, postForm, viewerFor } from "../setup/request";
import { type ArgsOf, outcome } from "./admin-harness";
import { givePin, PINS, signedCheckoff } from "./checkoffs-harness";

let db: Database;
let therapist: Viewer;
let preceptor: Viewer;
let manager: Viewer;
let educatorName = "";
/** A staff therapist who sits the annual exam (not a demo account). */
let examinee: Viewer;
let annualExamId = "";

beforeAll(async () => {
  db = await useSeededDatabase();
  therapist = await viewerFor("therapist@kestrelvalley.test");
  preceptor = await viewerFor("preceptor@kestrelvalley.test");
  manager = await viewerFor("manager@kestrelvalley.test");
  await givePin(therapist, PINS.therapist);
  await givePin(preceptor, PINS.preceptor);
  const [org] = await db.db.select().from(organisations).where(eq(organisations.id, therapist.org.id));
  educatorName = org.settings.educationLeadName ?? "";
  const [exam] = await db.db.select({ id: exams.id }).from(exams).where(and(eq(exams.orgId, therapist.org.id), eq(exams.title, "Annual ventilation modes exam")));
  annualExamId = exam.id;
  const [staff] = await db.db
    .select({ email: people.email })
    .from(people)
    .innerJoin(personRoles, eq(personRoles.personId, people.id))
    .where(and(eq(personRoles.role, "therapist"), eq(people.orgId, therapist.org.id), eq(people.active, true), ne(people.email, "therapist@kestrelvalley.test"), ne(people.email, "preceptor@kestrelvalley.test")))
    .orderBy(asc(people.email))
    .limit(1);
  examinee = await viewerFor(staff.email);
});

// ---- helpers -------------------------------------------------------------------------------

const run = <F extends (...a: any[]) => unknown>(f: F, request: Request, viewer: Viewer | null, params: Record<string, string>) => outcome(f(args<ArgsOf<F>>(request, viewer, params)));

async function certificatesFrom(sourceId: string) {
  return db.db.select().from(certificates).where(eq(certificates.sourceId, sourceId));
}

function rightAnswer(key: Key): SubmittedAnswer {
  switch (key.kind) {
    case "single":
      return { kind: "single", choice: key.correct };
    case "multiple":
      return { kind: "multiple", choices: key.correct };
    case "numeric":
      return { kind: "numeric", text: `${key.answer} ${key.unit}` };
    case "ordering":
      return { kind: "ordering", order: key.order };
    case "waveform-point":
      return { kind: "waveform-point", timeS: (key.fromS + key.toS) / 2 };
  }
}

/** Sits the annual exam answering every key, and hands it in at `handedIn`. */
async function passAnnualExam(who: Viewer, startedAt: Date, handedIn: Date): Promise<string> {
  const w = { orgId: who.org.id, personId: who.person.id, timeZone: who.org.timeZone };
  const started = await startAttempt(w, annualExamId, "all", startedAt, 4242);
  if (!started.ok) throw new Error(started.message);
  const [a] = await db.db.select().from(attempts).where(eq(attempts.id, started.attemptId));
  const form = a.form as StoredFormEntry[];
  const ids = form.map((f) => f.itemVersionId);
  const rows = await db.db.select().from(itemVersions).where(eq(itemVersions.orgId, who.org.id));
  const topics = await topicsOf(db.db, ids);
  const byId = new Map(rows.map((r) => [r.id, contentOf(r, topics.get(r.id) ?? [])]));
  for (const f of form) {
    const { key } = presentItem(byId.get(f.itemVersionId)!, f.itemSeed);
    const saved = await saveAnswer(w, started.attemptId, f.position, { answer: rightAnswer(key) }, new Date(startedAt.getTime() + 60_000));
    if (!saved.ok) throw new Error(saved.message);
  }
  const graded = await finishAttempt(who.org.id, started.attemptId, "submitted", handedIn);
  if (!graded?.score.passed) throw new Error("the attempt did not pass");
  return started.attemptId;
}

/** The middleware of /verify, then its loader, as the server runs them for a document request. */
async function verify(code: string): Promise<{ status: number; body: string; contentType: string | null; state?: string; shown?: Record<string, unknown> }> {
  const request = getRequest(`/verify/${encodeURIComponent(code)}`);
  const context = contextFor(null);
  let loaded: { certificate: Record<string, unknown> } | undefined;
  const next = async () => {
    loaded = (await verifyPage.loader(args<ArgsOf<typeof verifyPage.loader>>(request, null, { code }))) as unknown as typeof loaded;
    return new Response("the page", { status: 200 });
  };
  const [middleware] = verifyPage.middleware;
  const response = (await middleware({ request, params: { code }, context, unstable_pattern: "/verify/:code" } as unknown as Parameters<typeof middleware>[0], next as never)) as Response;
  return { status: response.status, body: await response.text(), contentType: response.headers.get("Content-Type"), state: loaded?.certificate.state as string | undefined, shown: loaded?.certificate };
}

// ---- issuing -------------------------------------------------------------------------------

describe("issuing", () => {
  it("a passed exam becomes one certificate, dated in the organisation's time zone, signed by the education lead, valid 12 months; issuing again adds none", async () => {
    // 03:30 UTC on 3 December is 21:30 on 2 December in Chicago (CST, UTC−6): the certificate's date is the 2nd.
    const attemptId = await passAnnualExam(examinee, new Date("2026-12-03T03:00:00Z"), new Date("2026-12-03T03:30:00Z"));
    const issued = await certificatesFrom(attemptId);
    expect(issued).toHaveLength(1);
    const [annual] = await db.db.select().from(requirements).where(and(eq(requirements.orgId, examinee.org.id), eq(requirements.examId, annualExamId)));
    expect(issued[0]).toMatchObject({
      personId: examinee.person.id,
      sourceType: "attempt",
      requirementId: annual.id,
      title: "Annual ventilation modes exam — passed 100 %",
      issuedOn: "2026-12-02",
      // Met on 2 December 2026, recurring every 12 months: due again 2 December 2027 and valid that day
      // (app/domain/status/plan.ts validThroughAfter; common practice, no source).
      validThrough: "2027-12-02",
      signerName: educatorName,
      revokedAt: null,
    });
    expect(educatorName).not.toBe("");
    expect(normaliseCertificateCode(issued[0].code)).toBe(issued[0].code);
    const [event] = await db.db.select().from(domainEvents).where(eq(domainEvents.subjectId, attemptId));
    expect(event.processedAt).not.toBeNull();

    // The sweep and a second call find nothing left to do, even run together.
    expect(await Promise.all([issuePendingCertificates(), issuePendingCertificates()])).toEqual([0, 0]);
    expect(await certificatesFrom(attemptId)).toHaveLength(1);
    const audits = await db.db.select().from(auditEvents).where(and(eq(auditEvents.action, "certificate.issued"), eq(auditEvents.entityId, issued[0].id)));
    expect(audits).toHaveLength(1);
    expect(JSON.parse(audits[0].detail)).toMatchObject({ personId: examinee.person.id, sourceType: "attempt", sourceId: attemptId });
  });

  it("an event whose own call never ran is issued by the sweep, once, even with two sweeps at once; an event whose certificate stands is not doubled", async () => {
    const subjectId = "00000000-0000-4000-8000-00000000c0de";
    await db.write(async (tx) => {
      await tx.insert(domainEvents).values({
        orgId: examinee.org.id,
        kind: "attempt.passed",
        subjectId,
        personId: examinee.person.id,
        payload: { examId: annualExamId, examVersion: 1, title: "Annual ventilation modes exam", requirementId: null, scorePercent: 84.6, passedAt: "2026-11-20T15:00:00.000Z" },
      });
    });
    const counts = await Promise.all([issuePendingCertificates(new Date("2026-12-02T12:00:00Z")), issuePendingCertificates(new Date("2026-12-02T12:00:00Z"))]);
    expect(counts[0] + counts[1]).toBe(1);
    const [one] = await certificatesFrom(subjectId);
    // The score is floored, never shown above what was earned; no requirement: no expiry.
    expect(one).toMatchObject({ title: "Annual ventilation modes exam — passed 84 %", issuedOn: "2026-11-20", validThrough: null });
    // Even if the event were somehow pending again, the certificate standing for its source is not doubled.
    await db.write((tx) => tx.update(domainEvents).set({ processedAt: null }).where(eq(domainEvents.subjectId, subjectId)));
    expect(await issuePendingCertificates()).toBe(0);
    expect(await certificatesFrom(subjectId)).toHaveLength(1);
  });

  it("a check-off signed competent becomes one certificate signed by the preceptor; signing raises checkoff.signed once", async () => {
    const checkoffId = await signedCheckoff(therapist, preceptor);
    const events = await db.db.select().from(domainEvents).where(and(eq(domainEvents.kind, "checkoff.signed"), eq(domainEvents.subjectId, checkoffId)));
    expect(events).toHaveLength(1);
    expect(events[0].processedAt).not.toBeNull();
    const record = (await getCheckoffRecord(therapist.org.id, checkoffId))!;
    const [me] = await db.db.select().from(people).where(eq(people.id, preceptor.person.id));
    const issued = await certificatesFrom(checkoffId);
    expect(issued).toHaveLength(1);
    const [req] = await db.db.select().from(requirements).where(and(eq(requirements.checklistId, record.checklist.id), eq(requirements.active, true)));
    expect(issued[0]).toMatchObject({
      personId: therapist.person.id,
      sourceType: "checkoff",
      title: `${record.checklist.title} — competent`,
      signerName: me.credentialLetters ? `${me.name}, ${me.credentialLetters}` : me.name,
      requirementId: req?.id ?? null,
    });
    expect(await issuePendingCertificates()).toBe(0);
    expect(await certificatesFrom(checkoffId)).toHaveLength(1);
    expect((await verifyAuditChain(db.db)).whole).toBe(true);
  });

  it("the seed gives the demo therapist a certificate, with a stable code (so the demo and its tests can find it)", async () => {
    const rows = await db.db.select().from(certificates).where(and(eq(certificates.personId, therapist.person.id), eq(certificates.sourceType, "checkoff")));
    const seeded = rows.find((r) => r.title.startsWith("Responding to a high-pressure alarm"));
    expect(seeded).toBeDefined();
    expect(seeded!.validThrough).toBeNull();
    expect(normaliseCertificateCode(seeded!.code)).toBe(seeded!.code);
  });
});

describe("the code", () => {
  it("is 12 Crockford base32 characters in three groups, read back whatever the case, spaces or look-alike letters", () => {
    // 60 bits of 0xFF… are all 31s: "Z" in Crockford's alphabet (Crockford, "Base32 Encoding", 2002).
    expect(certificateCodeFrom(new Uint8Array(8).fill(0xff))).toBe("ZZZZ-ZZZZ-ZZZZ");
    expect(certificateCodeFrom(new Uint8Array(8))).toBe("0000-0000-0000");
    // 0x01 in the last byte is the lowest bit of 60 (the top 4 of 64 bits are dropped): the last character is 1.
    expect(certificateCodeFrom(Uint8Array.from([0, 0, 0, 0, 0, 0, 0, 1]))).toBe("0000-0000-0001");
    expect(normaliseCertificateCode("abcd efgh jk1o")).toBe("ABCD-EFGH-JK10");
    expect(normaliseCertificateCode("ABCD-EFGH-JKLI")).toBe("ABCD-EFGH-JK11");
    expect(normaliseCertificateCode("ABCD-EFGH-JKU1")).toBeNull();
    expect(normaliseCertificateCode("ABCD-EFGH")).toBeNull();
  });
});

// ---- the PDF ---------------------------------------------------------------------------------

describe("the PDF", () => {
  it("reads back with poppler: one page, the name, title, code and caution in the shipped font, and a QR code that decodes to the verification address", async () => {
    const [cert] = await db.db.select().from(certificates).where(eq(certificates.personId, therapist.person.id)).limit(1);
    const res = (await certificatePdf.loader(args<ArgsOf<typeof certificatePdf.loader>>(getRequest(`/credentials/certificates/${cert.id}/certificate.pdf`), therapist, { certificateId: cert.id }))) as Response;
    expect(res.status).toBe(200);
    expect(res.headers.get("Content-Type")).toBe("application/pdf");
    expect(res.headers.get("Content-Disposition")).toMatch(/^attachment; filename="certificate-.+\.pdf"$/);
    const dir = mkdtempSync(path.join(tmpdir(), "tidemark-certificate-"));
    const file = path.join(dir, "certificate.pdf");
    writeFileSync(file, new Uint8Array(await res.arrayBuffer()));

    // Parsed back by an independent reader: poppler-utils (shared/TESTING.md, "PDFs").
    const info = spawnSync("pdfinfo", [file], { encoding: "utf8" }).stdout;
    expect(info).toMatch(/^Pages:\s+1$/m);
    const text = spawnSync("pdftotext", [file, "-"], { encoding: "utf8" }).stdout.replace(/\s+/g, " ");
    expect(text).toContain(therapist.person.name);
    expect(text).toContain(cert.title);
    expect(text).toContain(cert.code);
    expect(text).toContain(cert.signerName);
    expect(text).toContain(therapist.org.name);
    expect(text).toContain("educational record");
    expect(text).toContain("local policy");
    expect(text).toContain("licensed clinical judgement");
    const verifyUrl = `${env().publicUrl}/verify/${cert.code}`;
    expect(text).toContain(verifyUrl);
    // The shipped Source Sans 3, embedded (a subset: the "emb" column says yes).
    const fonts = spawnSync("pdffonts", [file], { encoding: "utf8" }).stdout;
    const sourceSans = fonts.split("\n").filter((l) => /SourceSans3/i.test(l));
    expect(sourceSans.length).toBeGreaterThan(0);
    for (const line of sourceSans) expect(line).toMatch(/\byes\b/);

    // The QR code: extracted as PNG by pdfimages and decoded by jsqr (an independent decoder).
    spawnSync("pdfimages", ["-png", file, path.join(dir, "img")]);
    const pngs = readdirSync(dir).filter((f) => f.startsWith("img") && f.endsWith(".png"));
    expect(pngs.length).toBeGreaterThan(0);
    const decoded = pngs.map((f) => {
      const png = PNG.sync.read(readFileSync(path.join(dir, f)));
      const rgba = new Uint8ClampedArray(png.width * png.height * 4);
      // pdfimages writes what the PDF holds: grey, RGB or RGBA; pngjs always gives RGBA.
      rgba.set(png.data.subarray(0, rgba.length));
      return jsQR(rgba, png.width, png.height)?.data ?? null;
    });
    expect(decoded).toContain(verifyUrl);
  });
});

// ---- verification ------------------------------------------------------------------------------

describe("/verify", () => {
  it("shows a valid certificate with only the name, what was met, the dates and its state", async () => {
    const [cert] = await db.db.select().from(certificates).where(and(eq(certificates.personId, therapist.person.id), eq(certificates.sourceType, "checkoff"))).limit(1);
    const answer = await verify(cert.code.toLowerCase());
    expect(answer.status).toBe(200);
    expect(answer.state).toBe("valid");
    expect(Object.keys(answer.shown!).sort()).toEqual(["issuedOn", "personName", "state", "timeZone", "title", "validThrough"]);
    expect(answer.shown).toMatchObject({ personName: therapist.person.name, title: cert.title, issuedOn: cert.issuedOn, validThrough: cert.validThrough });
  });

  it("shows expired once the valid-through date has passed (valid through is inclusive)", async () => {
    const [cert] = await db.write((tx) =>
      tx
        .insert(certificates)
        .values({ orgId: examinee.org.id, personId: examinee.person.id, sourceType: "attempt", sourceId: "00000000-0000-4000-8000-0000000e4b1d", title: "Annual ventilation modes exam — passed 90 %", code: "EXPD-0000-0001", issuedOn: "2024-11-01", validThrough: "2025-11-01", signerName: educatorName })
        .returning(),
    );
    const answer = await verify(cert.code);
    expect(answer.status).toBe(200);
    expect(answer.state).toBe("expired");
  });

  it("an unknown or malformed code answers a bare 404: plain text, no page", async () => {
    for (const code of ["0000-0000-0000", "not-a-code", "ZZZZ-ZZZZ-ZZZZ"]) {
      const answer = await verify(code);
      expect(answer).toMatchObject({ status: 404, body: "Not Found", state: undefined });
      expect(answer.contentType).toBe("text/plain; charset=utf-8");
    }
    // The loader alone (a client data request reaching it) answers the same bare 404.
    const thrown = await outcome(verifyPage.loader(args<ArgsOf<typeof verifyPage.loader>>(getRequest("/verify/0000-0000-0000"), null, { code: "0000-0000-0000" })));
    expect(thrown.status).toBe(404);
  });
});

// ---- who sees, who revokes ----------------------------------------------------------------------

describe("access and revoking", () => {
  let certId = "";
  let code = "";
  beforeAll(async () => {
    const [cert] = await db.db.select().from(certificates).where(and(eq(certificates.personId, therapist.person.id), eq(certificates.sourceType, "checkoff"))).orderBy(asc(certificates.createdAt)).limit(1);
    certId = cert.id;
    code = cert.code;
  });

  it("the holder sees it on Credentials and on its page; another therapist gets 404 for its page and its PDF", async () => {
    const list = await run(credentialsPage.loader, getRequest("/credentials"), therapist, {});
    expect((list.body as { certificates: { id: string }[] }).certificates.map((c) => c.id)).toContain(certId);
    const page = await run(certificatePage.loader, getRequest(`/credentials/certificates/${certId}`), therapist, { certificateId: certId });
    expect(page.status).toBe(200);
    expect(page.body).toMatchObject({ isHolder: true, mayRevoke: false, certificate: { id: certId, state: "valid" } });
    const other = await viewerFor(examinee.person.email);
    for (const f of [certificatePage.loader, certificatePdf.loader] as const) {
      expect((await run(f, getRequest(`/credentials/certificates/${certId}`), other, { certificateId: certId })).status).toBe(404);
    }
    // Alder Bay's admin neither (another organisation: the same 404).
    const foreign = await viewerFor("admin@alderbay.test");
    expect((await run(certificatePage.loader, getRequest("/"), { ...foreign, roles: ["therapist", "manager"] }, { certificateId: certId })).status).toBe(404);
  });

  it("a therapist cannot revoke (403), not even their own", async () => {
    const answer = await run(certificatePage.action, postForm(`/credentials/certificates/${certId}`, { intent: "revoke", reason: "Testing", confirm: "yes" }), therapist, { certificateId: certId });
    expect(answer.status).toBe(403);
    const [row] = await db.db.select().from(certificates).where(eq(certificates.id, certId));
    expect(row.revokedAt).toBeNull();
  });

  it("a manager of the holder's unit must give a reason and confirm; then it is revoked, audited, and /verify shows Revoked", async () => {
    const page = await run(certificatePage.loader, getRequest(`/credentials/certificates/${certId}`), manager, { certificateId: certId });
    expect(page.body).toMatchObject({ isHolder: false, mayRevoke: true });

    const noReason = await run(certificatePage.action, postForm(`/credentials/certificates/${certId}`, { intent: "revoke", reason: "  ", confirm: "yes" }), manager, { certificateId: certId });
    expect(noReason.status).toBe(400);
    expect(JSON.stringify(noReason.body)).toContain("Give the reason for revoking");
    const unconfirmed = await run(certificatePage.action, postForm(`/credentials/certificates/${certId}`, { intent: "revoke", reason: "Signed against the wrong checklist" }), manager, { certificateId: certId });
    expect(unconfirmed.status).toBe(400);
    expect((await verify(code)).state).toBe("valid");

    const reason = "Signed against the wrong checklist; to be repeated";
    const done = await run(certificatePage.action, postForm(`/credentials/certificates/${certId}`, { intent: "revoke", reason, confirm: "yes" }), manager, { certificateId: certId });
    expect(done.status).toBe(302);
    const [row] = await db.db.select().from(certificates).where(eq(certificates.id, certId));
    expect(row).toMatchObject({ revokedReason: reason, revokedBy: manager.person.id });
    expect(row.revokedAt).not.toBeNull();
    const audits = await db.db.select().from(auditEvents).where(and(eq(auditEvents.action, "certificate.revoked"), eq(auditEvents.entityId, certId)));
    expect(audits).toHaveLength(1);
    expect(audits[0].actorId).toBe(manager.person.id);
    expect(JSON.parse(audits[0].detail)).toMatchObject({ personId: therapist.person.id, reason });
    expect((await verify(code)).state).toBe("revoked");

    // A second revoke is refused (409), and the first reason stands.
    const again = await run(certificatePage.action, postForm(`/credentials/certificates/${certId}`, { intent: "revoke", reason: "Another", confirm: "yes" }), manager, { certificateId: certId });
    expect(again.status).toBe(409);
    expect((await db.db.select().from(certificates).where(eq(certificates.id, certId)))[0].revokedReason).toBe(reason);
    expect((await verifyAuditChain(db.db)).whole).toBe(true);
  });
});
