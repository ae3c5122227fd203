import { authenticate } from "~/api/token.server";
import { personStatus } from "~/api/data.server";
import { handle, requireBearer } from "~/api/handler.server";
import { json, methodNotAllowed, notFoundError } from "~/api/respond.server";
import type { Route } from "./+types/person-status";

export const middleware: Route.MiddlewareFunction[] = [requireBearer];

export async function loader({ request, params }: Route.LoaderArgs) {
  return handle(async () => {
    const caller = await authenticate(request, "read");
    const status = await personStatus(caller.orgId, caller.timeZone, params.personId);
    return status ? json(status) : notFoundError("person");
  });
}

/** Other methods: a token first (401 without one, as for GET), then 405. */
export async function action({ request }: Route.ActionArgs) {
  return handle(async () => {
    await authenticate(request, "read");
    return methodNotAllowed(["GET"]);
  });
}
