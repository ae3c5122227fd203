import { authenticate } from "~/api/token.server";
import { getCredential, updateCredentialByToken } from "~/api/data.server";
import { handle, readJsonObject, refuseOtherMethods, requireBearer } from "~/api/handler.server";
import { apiError, json, notFoundError, validationError } from "~/api/respond.server";
import { CREDENTIAL_PATCHABLE, parseCredentialBody } from "~/api/schemas";
import type { Route } from "./+types/credential";

export const middleware: Route.MiddlewareFunction[] = [requireBearer];

export async function loader({ request, params }: Route.LoaderArgs) {
  return handle(async () => {
    const caller = await authenticate(request, "read");
    const credential = await getCredential(caller.orgId, params.credentialId);
    return credential ? json(credential) : notFoundError("credential");
  });
}

export async function action({ request, params }: Route.ActionArgs) {
  return handle(async () => {
    if (request.method.toUpperCase() !== "PATCH") {
      await authenticate(request, "read");
      refuseOtherMethods(request, ["GET", "PATCH"]);
    }
    const caller = await authenticate(request, "write");
    const body = await readJsonObject(request);
    const unknown = Object.keys(body).filter((k) => !(CREDENTIAL_PATCHABLE as readonly string[]).includes(k));
    if (unknown.length) {
      return validationError(unknown.map((k) => ({ code: "custom", path: [k], message: `"${k}" cannot be changed here; only ${CREDENTIAL_PATCHABLE.join(", ")} can.`, input: undefined })));
    }
    if (Object.keys(body).length === 0) return apiError(400, "validation_failed", `Send at least one of ${CREDENTIAL_PATCHABLE.join(", ")}.`, { field: "body" });
    const before = await getCredential(caller.orgId, params.credentialId);
    if (!before) return notFoundError("credential");
    // The whole record after the change goes through the page's schema, so a new valid-through
    // date is checked against the stored issue date and the other way round.
    const merged: Record<string, unknown> = { personId: before.personId, credentialTypeId: before.credentialTypeId };
    for (const k of CREDENTIAL_PATCHABLE) {
      const value = k in body ? body[k] : before[k];
      if (value !== null) merged[k] = value;
    }
    const parsed = parseCredentialBody(merged);
    if (!parsed.success) return validationError(parsed.error.issues);
    const v = parsed.data;
    const result = await updateCredentialByToken(caller.orgId, caller.tokenId, before.id, { number: v.number, issuer: v.issuer, issuedOn: v.issuedOn, validThrough: v.validThrough ?? null });
    if (!result.ok) return apiError(result.status, result.status === 404 ? "not_found" : "validation_failed", result.message, { field: result.field });
    return json(result.credential);
  });
}
