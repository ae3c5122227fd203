import { requireViewer, notFound } from "~/auth/gate.server";
import { findFile, fileResponse } from "~/files/store.server";
import { requireVisibleCheckoff } from "./record-access.server";
import type { Route } from "./+types/evidence";

/** Evidence is served only to someone who may see its check-off, and only as a download. */
export async function loader({ context, params }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:checkoffs");
  const record = await requireVisibleCheckoff(viewer, params.checkoffId);
  const evidence = record.evidence.find((e) => e.id === params.evidenceId);
  const file = evidence ? await findFile(viewer.org.id, evidence.fileId) : null;
  if (!evidence || !file) notFound("We could not find that evidence.", true);
  return fileResponse(file, evidence.name);
}
