import { type RouteConfig, index, layout, prefix, route } from "@react-router/dev/routes";

/**
 * Every address of Tidemark, grouped by section. Each route here must also have a row in
 * app/auth/route-access.ts (the authorisation table); a test fails when one is missing.
 */
export default [
  index("routes/home.tsx"),
  route("healthz", "routes/api/healthz.ts"),
  // The JSON API (bearer tokens, no session) and its OpenAPI document
  ...prefix("api/v1", [
    route("openapi.json", "routes/api/v1/openapi.ts"),
    route("people", "routes/api/v1/people.ts"),
    route("people/:personId/status", "routes/api/v1/person-status.ts"),
    route("units", "routes/api/v1/units.ts"),
    route("requirements", "routes/api/v1/requirements.ts"),
    route("exam-results", "routes/api/v1/exam-results.ts"),
    route("exam-attempts/:attemptId", "routes/api/v1/exam-attempt.ts"),
    route("team-matrix", "routes/api/v1/team-matrix.ts"),
    route("clearances", "routes/api/v1/clearances.ts"),
    route("credentials", "routes/api/v1/credentials.ts"),
    route("credentials/:credentialId", "routes/api/v1/credential.ts"),
  ]),

  // Calendar feeds: the address carries its own unguessable token, not the session
  route("calendar/:token", "routes/calendar-feed.ts"),

  // Public verification of a certificate's code (printed on the PDF and in its QR code)
  route("verify/:code", "routes/verify.tsx"),

  // Sign-in and sign-out
  route("login", "routes/auth/login.tsx"),
  route("login/code", "routes/auth/login-code.tsx"),
  route("login/magic", "routes/auth/login-magic.tsx"),
  route("logout", "routes/auth/logout.ts"),

  // Demo mode only: the local e-mail fake's messages, and a deliberate server error
  route("dev/outbox", "routes/dev/outbox.tsx"),
  route("dev/fault", "routes/dev/fault.tsx"),

  // The signed-in product: the shell (top bar, section strip), each section gated in its layout
  layout("routes/shell.tsx", [
    route("today", "routes/today/index.tsx"),
    layout("routes/plan/layout.tsx", [
      route("plan", "routes/plan/index.tsx"),
      route("plan/calendar", "routes/plan/calendar.tsx"),
      route("plan/reminders", "routes/plan/reminders.tsx"),
    ]),
    layout("routes/exams/layout.tsx", [
      route("exams", "routes/exams/index.tsx"),
      route("exams/:examId/start", "routes/exams/start.tsx"),
      route("exams/attempts/:attemptId", "routes/exams/attempt.tsx"),
      route("exams/attempts/:attemptId/answers", "routes/exams/answers.ts"),
      route("exams/attempts/:attemptId/result", "routes/exams/result.tsx"),
    ]),
    layout("routes/bench/layout.tsx", [route("bench", "routes/bench/index.tsx")]),
    layout("routes/team/layout.tsx", [
      route("team", "routes/team/index.tsx"),
      route("team/requirements", "routes/team/requirements.tsx"),
      route("team/matrix", "routes/team/matrix.tsx"),
      route("team/matrix/export", "routes/team/matrix-export.ts"),
      route("team/people/:personId/requirements/:requirementId", "routes/team/cell.tsx"),
      route("team/accommodations", "routes/team/accommodations.tsx"),
    ]),
    layout("routes/clearance/layout.tsx", [route("clearance", "routes/clearance/index.tsx")]),
    layout("routes/reports/layout.tsx", [
      route("reports", "routes/reports/index.tsx"),
      route("reports/compliance", "routes/reports/compliance.tsx"),
      route("reports/compliance.csv", "routes/reports/compliance-csv.ts"),
      route("reports/compliance.pdf", "routes/reports/compliance-pdf.ts"),
      route("reports/expiries", "routes/reports/expiries.tsx"),
      route("reports/expiries.csv", "routes/reports/expiries-csv.ts"),
      route("reports/expiries.pdf", "routes/reports/expiries-pdf.ts"),
      route("reports/completions", "routes/reports/completions.tsx"),
      route("reports/completions.csv", "routes/reports/completions-csv.ts"),
      route("reports/completions.pdf", "routes/reports/completions-pdf.ts"),
      route("reports/packet", "routes/reports/packet.tsx"),
      route("reports/packet.pdf", "routes/reports/packet-pdf.ts"),
    ]),
    layout("routes/credentials/layout.tsx", [
      route("credentials", "routes/credentials/index.tsx"),
      route("credentials/:credentialId/scan", "routes/credentials/scan.ts"),
      route("credentials/certificates/:certificateId", "routes/credentials/certificate.tsx"),
      route("credentials/certificates/:certificateId/certificate.pdf", "routes/credentials/certificate-pdf.ts"),
    ]),
    layout("routes/checkoffs/layout.tsx", [
      route("checkoffs", "routes/checkoffs/index.tsx"),
      route("checkoffs/signing-pin", "routes/checkoffs/signing-pin.tsx"),
      route("checkoffs/orientation", "routes/checkoffs/orientation.tsx"),
      route("checkoffs/checklists", "routes/checkoffs/checklists.tsx"),
      route("checkoffs/checklists/:checklistId", "routes/checkoffs/checklist.tsx"),
      route("checkoffs/:checkoffId", "routes/checkoffs/checkoff.tsx"),
    ]),
    layout("routes/bank/layout.tsx", [
      route("bank", "routes/bank/index.tsx"),
      route("bank/items/new", "routes/bank/item-new.tsx"),
      route("bank/items/:itemId", "routes/bank/item.tsx"),
      route("bank/items/:itemId/edit", "routes/bank/item-edit.tsx"),
      route("bank/items/:itemId/versions/:version", "routes/bank/item-version.tsx"),
      route("bank/import", "routes/bank/import.tsx"),
      route("bank/export", "routes/bank/export.ts"),
      route("bank/exams", "routes/bank/exams.tsx"),
      route("bank/exams/new", "routes/bank/exam-new.tsx"),
      route("bank/exams/:examId", "routes/bank/exam.tsx"),
      route("bank/exams/:examId/edit", "routes/bank/exam-edit.tsx"),
      route("bank/exams/:examId/analysis", "routes/bank/exam-analysis.tsx"),
      route("bank/exams/:examId/analysis.csv", "routes/bank/exam-analysis-csv.ts"),
      route("bank/exams/:examId/analysis.pdf", "routes/bank/exam-analysis-pdf.ts"),
      route("bank/exams/:examId/cut-score", "routes/bank/exam-cut-score.tsx"),
    ]),
    ...prefix("admin", [
      layout("routes/admin/layout.tsx", [
        index("routes/admin/index.tsx"),
        route("units", "routes/admin/units.tsx"),
        route("people", "routes/admin/people.tsx"),
        route("people/new", "routes/admin/person-new.tsx"),
        route("people/:personId", "routes/admin/person.tsx"),
        route("references", "routes/admin/references.tsx"),
        route("audit", "routes/admin/audit.tsx"),
        route("api", "routes/admin/api.tsx"),
        route("roster", "routes/admin/roster.tsx"),
        route("reminders", "routes/admin/reminders.tsx"),
      ]),
    ]),
  ]),

  // A check-off's record as a printable page, a PDF and its evidence: outside the shell (no top
  // bar on paper), gated by their own layout like any section.
  layout("routes/checkoffs/record-layout.tsx", [
    route("checkoffs/:checkoffId/print", "routes/checkoffs/print.tsx"),
    route("checkoffs/:checkoffId/record.pdf", "routes/checkoffs/record-pdf.ts"),
    route("checkoffs/:checkoffId/evidence/:evidenceId", "routes/checkoffs/evidence.ts"),
  ]),

  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
