import { randomUUID } from "node:crypto";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import type { AddressInfo } from "node:net";
import { openOutbox, type Outbox, type OutboxMessage } from "./outbox-store";

/**
 * Local stand-in for the e-mail service: the part of its REST API that the Resend SDK
 * calls to send (`POST /emails`), plus read-only listing for the Outbox page and tests.
 * Dev and test tooling only — it never delivers anything.
 */
export type MailFakeOptions = {
  /** 0 picks a free port. */
  port: number;
  dataDir: string;
  /** When set, only this key is accepted (403 otherwise); by default any non-empty key is. */
  apiKey?: string;
};

export type MailFake = {
  /** e.g. `http://127.0.0.1:3001` — the SDK's `baseUrl`. */
  url: string;
  close: () => Promise<void>;
  /** Every message kept, newest first (the same order as `GET /emails`). */
  messages: () => OutboxMessage[];
};

/** The service's error body (the SDK passes it through as its `error`). */
type ServiceError = { statusCode: number; name: string; message: string };

const MAX_BODY_BYTES = 10 * 1024 * 1024;

export async function startMailFake(options: MailFakeOptions): Promise<MailFake> {
  const outbox = openOutbox(options.dataDir);
  const server = createServer((request, response) => {
    handle(request, response, outbox, options).catch((error: unknown) => {
      sendError(response, { statusCode: 500, name: "internal_server_error", message: String(error) });
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port, "127.0.0.1", () => resolve());
  });
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}`,
    messages: () => outbox.list(),
    close: () =>
      new Promise<void>((resolve, reject) => {
        server.close((error) => (error ? reject(error) : resolve()));
        // Keep-alive sockets from fetch would hold close() open otherwise.
        server.closeAllConnections();
      }),
  };
}

async function handle(request: IncomingMessage, response: ServerResponse, outbox: Outbox, options: MailFakeOptions) {
  const { pathname } = new URL(request.url ?? "/", "http://127.0.0.1");
  const method = request.method ?? "GET";
  const one = /^\/emails\/([^/]+)$/.exec(pathname);

  if (pathname === "/emails" && method === "POST") return createEmail(request, response, outbox, options);
  if (pathname === "/emails" && method === "GET") {
    return sendJson(response, 200, { object: "list", has_more: false, data: outbox.list() });
  }
  if (one && method === "GET") {
    const message = outbox.find(decodeURIComponent(one[1]));
    if (message) return sendJson(response, 200, message);
    return sendError(response, { statusCode: 404, name: "not_found", message: "Email not found" });
  }
  if (pathname === "/emails" || one) {
    return sendError(response, {
      statusCode: 405,
      name: "method_not_allowed",
      message: `${method} is not allowed: the outbox is append-only (POST to send, GET to read).`,
    });
  }
  return sendError(response, { statusCode: 404, name: "not_found", message: "The requested endpoint does not exist." });
}

async function createEmail(request: IncomingMessage, response: ServerResponse, outbox: Outbox, options: MailFakeOptions) {
  const key = /^Bearer\s+(\S+)\s*$/i.exec(request.headers.authorization ?? "")?.[1];
  if (!key) {
    return sendError(response, {
      statusCode: 401,
      name: "missing_api_key",
      message: "Missing API key in the authorization header. Include the header Authorization: Bearer <key>.",
    });
  }
  if (options.apiKey !== undefined && key !== options.apiKey) {
    return sendError(response, { statusCode: 403, name: "invalid_api_key", message: "API key is invalid" });
  }

  let raw: string;
  try {
    raw = await readBody(request);
  } catch {
    return sendError(response, { statusCode: 413, name: "validation_error", message: "The body is larger than 10 MB." });
  }
  let body: Record<string, unknown>;
  try {
    const parsed: unknown = JSON.parse(raw);
    if (typeof parsed !== "object" || parsed === null || Array.isArray(parsed)) throw new Error("not an object");
    body = parsed as Record<string, unknown>;
  } catch {
    return sendError(response, { statusCode: 422, name: "validation_error", message: "The body must be a JSON object." });
  }

  const from = typeof body.from === "string" ? body.from.trim() : "";
  const to = addresses(body.to);
  const subject = typeof body.subject === "string" ? body.subject : "";
  for (const [field, missing] of [["from", !from], ["to", to.length === 0], ["subject", !subject]] as const) {
    if (missing) return sendError(response, { statusCode: 422, name: "missing_required_field", message: `Missing \`${field}\` field.` });
  }

  const stored = outbox.append({
    id: randomUUID(),
    from,
    to,
    cc: addresses(body.cc),
    bcc: addresses(body.bcc),
    reply_to: addresses(body.reply_to),
    subject,
    html: typeof body.html === "string" ? body.html : null,
    text: typeof body.text === "string" ? body.text : null,
    tags: Array.isArray(body.tags) ? (body.tags as OutboxMessage["tags"]) : [],
  });
  return sendJson(response, 200, { id: stored.id });
}

/** The service accepts one address or a list of them. */
function addresses(value: unknown): string[] {
  const list = Array.isArray(value) ? value : [value];
  return list.filter((v): v is string => typeof v === "string" && v.trim() !== "").map((v) => v.trim());
}

function readBody(request: IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    request.on("data", (chunk: Buffer) => {
      size += chunk.length;
      if (size > MAX_BODY_BYTES) {
        request.removeAllListeners("data");
        request.resume();
        reject(new Error("body too large"));
      } else chunks.push(chunk);
    });
    request.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    request.on("error", reject);
  });
}

function sendJson(response: ServerResponse, status: number, payload: unknown) {
  response.writeHead(status, { "content-type": "application/json; charset=utf-8" });
  response.end(JSON.stringify(payload));
}

function sendError(response: ServerResponse, error: ServiceError) {
  if (response.headersSent) return void response.end();
  sendJson(response, error.statusCode, error);
}
