/**
 * The OpenAPI 3.1 document, built from the route table (app/api/endpoints.ts) and the zod
 * schemas the routes use, with zod's own `z.toJSONSchema` (JSON Schema 2020-12, the dialect of
 * OpenAPI 3.1: "OpenAPI Specification v3.1.0", OpenAPI Initiative, 2021, §4.8.24).
 */
import { z } from "zod";
import { API_ENDPOINTS, openApiPath, type Endpoint } from "./endpoints";
import { API_SCHEMAS, credentialBodyJsonSchema } from "./schemas";

type JsonObject = Record<string, unknown>;

function clean(schema: JsonObject): JsonObject {
  const { $schema: _s, $id: _i, ...rest } = schema;
  return rest;
}

function refTo(schema: z.ZodType): JsonObject {
  const id = API_SCHEMAS.get(schema)?.id;
  if (!id) throw new Error("Every API answer schema is registered in API_SCHEMAS with an id.");
  return { $ref: `#/components/schemas/${id}` };
}

const ERROR_RESPONSES: Record<string, string> = {
  "400": "Bad request: a field is not valid (see error.field / error.fields), or a token was put in the address",
  "401": "No token, or an unknown, revoked or expired one",
  "403": "The token lacks the scope this call needs",
  "429": "Too many calls with this token; wait Retry-After seconds",
};

function operation(e: Endpoint): JsonObject {
  const parameters: JsonObject[] = [];
  for (const p of e.pathParams ?? []) parameters.push({ name: p.name, in: "path", required: true, description: p.description, schema: { type: "string" } });
  if (e.query) {
    for (const [name, field] of Object.entries(e.query.shape)) {
      const schema = clean(z.toJSONSchema(field as z.ZodType, { io: "input", unrepresentable: "any" }) as JsonObject);
      const { description, ...rest } = schema;
      parameters.push({ name, in: "query", required: false, ...(description ? { description } : {}), schema: rest });
    }
  }
  const responses: JsonObject = {
    [String(e.status)]: {
      description: e.summary,
      content: { "application/json": { schema: e.response === "openapi" ? { type: "object" } : refTo(e.response) } },
    },
  };
  if (e.scope) {
    for (const [code, description] of Object.entries(ERROR_RESPONSES)) {
      if (code === "400" && !e.query && !e.body && !e.pathParams) continue;
      responses[code] = { description, content: { "application/json": { schema: { $ref: "#/components/schemas/Error" } } } };
    }
    if (e.pathParams) responses["404"] = { description: "No such record in the token's organisation", content: { "application/json": { schema: { $ref: "#/components/schemas/Error" } } } };
  }
  return {
    operationId: `${e.method}${openApiPath(e.route).replace(/^\/api\/v1/, "").replace(/[{}]/g, "").split(/[/.-]/).map((w) => (w ? w[0].toUpperCase() + w.slice(1) : "")).join("")}`,
    summary: e.summary,
    description: e.scope ? `${e.description} Needs a token with the "${e.scope}" scope.` : e.description,
    security: e.scope ? [{ bearer: [] }] : [],
    ...(parameters.length ? { parameters } : {}),
    ...(e.body
      ? {
          requestBody: {
            required: true,
            content: { "application/json": { schema: { $ref: `#/components/schemas/${e.body === "create-credential" ? "CredentialCreate" : "CredentialUpdate"}` } } },
          },
        }
      : {}),
    responses,
  };
}

export function buildOpenApiDocument(serverUrl?: string): JsonObject {
  const paths: Record<string, JsonObject> = {};
  for (const e of API_ENDPOINTS) {
    const path = openApiPath(e.route);
    paths[path] = { ...(paths[path] ?? {}), [e.method]: operation(e) };
  }
  const generated = z.toJSONSchema(API_SCHEMAS, { uri: (id) => `#/components/schemas/${id}` }) as { schemas: Record<string, JsonObject> };
  const schemas: Record<string, JsonObject> = {};
  for (const [id, schema] of Object.entries(generated.schemas)) schemas[id] = clean(schema);
  schemas.CredentialCreate = clean(credentialBodyJsonSchema("create"));
  schemas.CredentialUpdate = clean(credentialBodyJsonSchema("update"));
  return {
    openapi: "3.1.0",
    info: {
      title: "Tidemark API",
      version: "1.0.0",
      description:
        "Read people, units, requirements, statuses, exam results, clearances and credentials; record and change credentials. Every call but this document needs an API token from Admin → API, sent as \"Authorization: Bearer <token>\"; a token sees only its own organisation. Errors are { error: { code, message, field? } }.",
    },
    ...(serverUrl ? { servers: [{ url: serverUrl }] } : {}),
    security: [{ bearer: [] }],
    paths,
    components: {
      securitySchemes: { bearer: { type: "http", scheme: "bearer", description: "An API token created under Admin → API (shown once)." } },
      schemas,
    },
  };
}
