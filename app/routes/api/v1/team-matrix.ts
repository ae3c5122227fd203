import { authenticate } from "~/api/token.server";
import { handle, parseQuery, requireBearer } from "~/api/handler.server";
import { apiError, json, methodNotAllowed } from "~/api/respond.server";
import { TeamMatrixQuery } from "~/api/schemas";
import { teamMatrixForApi } from "~/api/views.server";
import type { Route } from "./+types/team-matrix";

export const middleware: Route.MiddlewareFunction[] = [requireBearer];

/** The Team matrix of the whole organisation, filtered and sorted as the page does (matrixView). */
export async function loader({ request }: Route.LoaderArgs) {
  return handle(async () => {
    const caller = await authenticate(request, "read");
    const query = parseQuery(request, TeamMatrixQuery);
    const page = await teamMatrixForApi(caller.orgId, caller.timeZone, query, { limit: query.limit });
    if (!page) throw apiError(400, "validation_failed", "This cursor is not one we issued. Pass nextCursor from the previous page as it is.", { field: "cursor", fields: [{ field: "cursor", message: "Not a cursor we issued." }] });
    return json(page);
  });
}

/** Other methods: a token first (401 without one, as for GET), then 405. */
export async function action({ request }: Route.ActionArgs) {
  return handle(async () => {
    await authenticate(request, "read");
    return methodNotAllowed(["GET"]);
  });
}
