/**
 * The API's answers for what the pages fetch in place, drawn from the very server functions the
 * pages use: the Team matrix from `matrixView` (as /team/matrix and its export), an attempt's
 * progress from `attemptProgress` (as the exam page's save reply). A page and the API therefore
 * filter, sort, judge and count the same way.
 */
import type { z } from "zod";
import { attemptProgress, type AttemptProgress } from "~/db/queries/exam-attempts.server";
import { matrixView } from "~/db/queries/team-matrix.server";
import type { PageArgs } from "./data.server";
import type { TeamMatrixPage, TeamMatrixQuery } from "./schemas";

/** The matrix is a sorted view, not a table with a key: its cursor is the offset, opaque to clients. */
const offsetCursor = (offset: number) => Buffer.from(`o:${offset}`).toString("base64url");
function offsetOf(cursor: string | undefined): number | null {
  if (!cursor) return 0;
  const match = /^o:(\d{1,9})$/.exec(Buffer.from(cursor, "base64url").toString("utf8"));
  return match ? Number(match[1]) : null;
}

/** The whole organisation's matrix (a token is not bounded to units), one page of it; null for an unreadable cursor. */
export async function teamMatrixForApi(
  orgId: string,
  timeZone: string,
  query: z.infer<typeof TeamMatrixQuery>,
  { limit }: Pick<PageArgs, "limit">,
  now: Date = new Date(),
): Promise<z.infer<typeof TeamMatrixPage> | null> {
  const offset = offsetOf(query.cursor);
  if (offset === null) return null;
  const { options, matrix, matching } = await matrixView(
    orgId,
    { unitIds: null },
    timeZone,
    { q: query.q ?? "", unit: query.unitId ?? "", role: query.role ?? "", status: query.status ?? "", sort: query.sort, dir: query.dir },
    now,
  );
  const slice = matching.slice(offset, offset + limit);
  return {
    today: options.today,
    requirements: matrix.columns.map((c) => ({ id: c.id, name: c.name, kind: c.kind })),
    matching: matching.length,
    data: slice.map((p) => ({
      person: { id: p.id, name: p.name, employeeId: p.employeeId, homeUnit: p.homeUnit },
      cells: matrix.columns.flatMap((c) => {
        const cell = p.cells[c.id];
        if (!cell) return [];
        return [
          {
            requirementId: c.id,
            status: cell.status,
            date: cell.dateMeaning === "due" && cell.extendedTo ? cell.extendedTo : cell.date,
            dateMeaning: cell.dateMeaning,
            waivedThrough: cell.waivedThrough,
          },
        ];
      }),
    })),
    nextCursor: offset + limit < matching.length ? offsetCursor(offset + limit) : null,
  };
}

export function examAttemptForApi(orgId: string, attemptId: string, now: Date = new Date()): Promise<AttemptProgress | null> {
  return attemptProgress(orgId, attemptId, now);
}
