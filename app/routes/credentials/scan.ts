/**
 * A credential's scan, as a download: only to the person who holds it and to a manager of one of
 * their units (issue 8 §3; OWASP ASVS 4.0.3 V12). Anyone else gets the same 404 as for a scan
 * that does not exist, so ids cannot be probed.
 */
import { notFound, requireViewer } from "~/auth/gate.server";
import { can } from "~/auth/roles";
import { scanFor } from "~/db/queries/credentials.server";
import { fileResponse } from "~/files/store.server";
import type { Route } from "./+types/scan";

export async function loader({ params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:credentials");
  const found = await scanFor(viewer.org.id, viewer.person.id, can(viewer.roles, "credentials:verify"), params.credentialId);
  if (!found) notFound("We could not find that scan.", true);
  return fileResponse(found.file, found.file.originalName ?? `${found.typeName} scan`);
}
