import { buildOpenApiDocument } from "~/api/openapi";
import { json } from "~/api/respond.server";

// Public: the document describes the API and holds no data.
export async function loader() {
  return json(buildOpenApiDocument(process.env.PUBLIC_URL ? `${process.env.PUBLIC_URL.replace(/\/$/, "")}/api/v1` : undefined), 200, { "Cache-Control": "public, max-age=300" });
}
