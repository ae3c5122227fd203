/**
 * What every report route starts with: the viewer (reports:read), their scope (a manager's
 * units, or the whole organisation for an educator — the Team matrix's rule), the organisation's
 * status options today, and the report's dates read from the address.
 */
import type { RouterContextProvider } from "react-router";
import { requireViewer } from "~/auth/gate.server";
import { statusOptionsFor } from "~/db/queries/people.server";
import type { ReportScope } from "~/db/queries/reports.server";
import { matrixScopeFor } from "~/db/queries/team-matrix.server";
import { checkRange, checkReportDay, type DayCheck, type RangeCheck } from "~/domain/reports/as-of";
import { addDays } from "~/domain/status";

export async function reportViewer(context: Readonly<RouterContextProvider>) {
  const viewer = requireViewer(context, "reports:read");
  const [scope, options] = await Promise.all([
    matrixScopeFor(viewer.org.id, viewer.person.id, viewer.roles) as Promise<ReportScope>,
    statusOptionsFor(viewer.org.id, viewer.org.timeZone),
  ]);
  return { viewer, scope, options };
}

/** ?on= for the compliance report (today when absent). */
export function dayFrom(request: Request, today: string): DayCheck & { raw: string } {
  const raw = new URL(request.url).searchParams.get("on") ?? "";
  return { ...checkReportDay(raw, today), raw };
}

/** ?from=&to= for expiries: today through 90 days ahead by default. */
export function expiryRangeFrom(request: Request, today: string): RangeCheck & { raw: { from: string; to: string } } {
  const params = new URL(request.url).searchParams;
  const raw = { from: params.get("from") ?? "", to: params.get("to") ?? "" };
  return { ...checkRange(raw.from, raw.to, { from: today, to: addDays(today, 90) }), raw };
}

/** ?from=&to= for completions: the 90 days up to today by default. */
export function completionRangeFrom(request: Request, today: string): RangeCheck & { raw: { from: string; to: string } } {
  const params = new URL(request.url).searchParams;
  const raw = { from: params.get("from") ?? "", to: params.get("to") ?? "" };
  return { ...checkRange(raw.from, raw.to, { from: addDays(today, -90), to: today }), raw };
}

/** A refused query on a download: 400 with the reason in plain words. */
export function badRequest(message: string): Response {
  return new Response(message, { status: 400, headers: { "Content-Type": "text/plain; charset=utf-8", "X-Content-Type-Options": "nosniff" } });
}

export function csvResponse(body: string, filename: string): Response {
  return new Response(body, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="${filename}"`,
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-store",
    },
  });
}

export function pdfResponse(pdf: Buffer, filename: string): Response {
  return new Response(new Uint8Array(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `attachment; filename="${filename}"`,
      "Content-Length": String(pdf.length),
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-store",
    },
  });
}
