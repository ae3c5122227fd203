/**
 * The item analysis as CSV rows: one row per item with its statistics and flags (the same
 * numbers as the page). Text cells a spreadsheet would run as a formula are neutralised and
 * quoted by the Team export's writer (app/routes/team/csv.ts: OWASP "CSV Injection"); numbers we
 * format ourselves (digits, a point and perhaps a leading minus) are written as they are, so a
 * negative correlation stays a number in the spreadsheet instead of text behind an apostrophe.
 */
import type { ItemAnalysisView } from "~/db/queries/item-analysis.server";
import { FLAG_TEXT } from "~/domain/psychometrics/form-analysis";
import { toCsv } from "../team/csv";

export const CSV_HEADER = [
  "Item id",
  "Stem",
  "Topics",
  "Kind",
  "Item versions answered",
  "Seen by",
  "p",
  "Point-biserial",
  "Corrected point-biserial",
  "D",
  "Upper correct",
  "Lower correct",
  "Group size",
  "Flags",
] as const;

/** A number we formatted: written bare. */
type NumberCell = { number: string };
const num = (n: number | null, digits = 4): NumberCell => ({ number: n === null ? "" : n.toFixed(digits) });
/** One text cell, escaped and quoted by the shared writer (which ends its line with CRLF). */
const text = (value: string) => toCsv([[value]]).slice(0, -2);

export function analysisCsv(view: ItemAnalysisView): string {
  const rows: (string | NumberCell)[][] = [
    [...CSV_HEADER],
    ...view.items.map((i) => [
      i.itemId,
      i.stem,
      i.topics.join("; "),
      i.kind,
      i.versionsSeen.join("; "),
      num(i.seenBy, 0),
      num(i.p),
      num(i.pointBiserial),
      num(i.correctedPointBiserial),
      num(i.discrimination),
      num(i.upperCorrect, 2),
      num(i.lowerCorrect, 2),
      num(i.groupSize, 0),
      [...i.flags.map((f) => FLAG_TEXT[f].label), ...(i.fewAnswers ? ["Few answers"] : [])].join("; "),
    ]),
  ];
  return rows.map((r) => r.map((c) => (typeof c === "string" ? text(c) : c.number)).join(",")).join("\r\n") + "\r\n";
}
