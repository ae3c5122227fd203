import { authenticate } from "~/api/token.server";
import { handle, requireBearer } from "~/api/handler.server";
import { json, methodNotAllowed, notFoundError } from "~/api/respond.server";
import { examAttemptForApi } from "~/api/views.server";
import type { Route } from "./+types/exam-attempt";

export const middleware: Route.MiddlewareFunction[] = [requireBearer];

/** Where an attempt stands, as the exam page's save reply says it (attemptProgress); never its answers or keys. */
export async function loader({ request, params }: Route.LoaderArgs) {
  return handle(async () => {
    const caller = await authenticate(request, "read");
    const progress = await examAttemptForApi(caller.orgId, params.attemptId);
    return progress ? json(progress) : notFoundError("exam attempt");
  });
}

/** Other methods: a token first (401 without one, as for GET), then 405. */
export async function action({ request }: Route.ActionArgs) {
  return handle(async () => {
    await authenticate(request, "read");
    return methodNotAllowed(["GET"]);
  });
}
