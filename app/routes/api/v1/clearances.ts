import { authenticate } from "~/api/token.server";
import { listClearancesPage } from "~/api/data.server";
import { handle, pageArgs, parseQuery, requireBearer } from "~/api/handler.server";
import { json, methodNotAllowed } from "~/api/respond.server";
import { ClearancesQuery } from "~/api/schemas";
import type { Route } from "./+types/clearances";

export const middleware: Route.MiddlewareFunction[] = [requireBearer];

// Derived from the records on each request, as the Clearance board is (one derivation).
export async function loader({ request }: Route.LoaderArgs) {
  return handle(async () => {
    const caller = await authenticate(request, "read");
    const query = parseQuery(request, ClearancesQuery);
    return json(await listClearancesPage(caller.orgId, caller.timeZone, { unitId: query.unitId, checklistId: query.checklistId }, pageArgs(query)));
  });
}

/** Other methods: a token first (401 without one, as for GET), then 405. */
export async function action({ request }: Route.ActionArgs) {
  return handle(async () => {
    await authenticate(request, "read");
    return methodNotAllowed(["GET"]);
  });
}
