import { authenticate } from "~/api/token.server";
import { createCredentialByToken, listCredentialsPage } from "~/api/data.server";
import { handle, pageArgs, parseQuery, readJsonObject, refuseOtherMethods, requireBearer } from "~/api/handler.server";
import { apiError, json, validationError } from "~/api/respond.server";
import { CredentialsQuery, parseCredentialBody } from "~/api/schemas";
import type { Route } from "./+types/credentials";

export const middleware: Route.MiddlewareFunction[] = [requireBearer];

export async function loader({ request }: Route.LoaderArgs) {
  return handle(async () => {
    const caller = await authenticate(request, "read");
    const query = parseQuery(request, CredentialsQuery);
    return json(await listCredentialsPage(caller.orgId, { personId: query.personId }, pageArgs(query)));
  });
}

export async function action({ request }: Route.ActionArgs) {
  return handle(async () => {
    if (request.method.toUpperCase() !== "POST") {
      await authenticate(request, "read");
      refuseOtherMethods(request, ["GET", "POST"]);
    }
    const caller = await authenticate(request, "write");
    const body = await readJsonObject(request);
    // null means "none", as an empty field does on the page.
    const given = Object.fromEntries(Object.entries(body).filter(([, v]) => v !== null));
    const parsed = parseCredentialBody(given);
    if (!parsed.success) return validationError(parsed.error.issues);
    const v = parsed.data;
    const result = await createCredentialByToken(caller.orgId, caller.tokenId, {
      personId: v.personId,
      credentialTypeId: v.credentialTypeId,
      number: v.number,
      issuer: v.issuer,
      issuedOn: v.issuedOn,
      validThrough: v.validThrough ?? null,
      validThroughGiven: "validThrough" in body,
    });
    if (!result.ok) return apiError(result.status, result.status === 404 ? "not_found" : "validation_failed", result.message, { field: result.field, fields: [{ field: result.field, message: result.message }] });
    return json(result.credential, 201, { Location: `/api/v1/credentials/${result.credential.id}` });
  });
}
