/**
 * The production server's first middleware (scripts/serve.mjs uses it through the build's
 * server entry): a fresh Content-Security-Policy nonce for every request, the header set of
 * app/security/policy.ts written on every response just before its headers go out (so a route's
 * own headers cannot duplicate or weaken them), and the body-size check that answers an
 * oversize request 413 before a byte of it is read.
 */
import { randomBytes } from "node:crypto";
import type { IncomingMessage, ServerResponse } from "node:http";
import helmet from "helmet";
import onHeaders from "on-headers";
import { helmetOptions, judgeBody, PERMISSIONS_POLICY, type PolicySettings } from "./policy";

/** The request header that carries the nonce from the server to app/entry.server.tsx. */
export const NONCE_HEADER = "x-tidemark-nonce";

type Next = (error?: unknown) => void;

export function securityMiddleware(settings: PolicySettings) {
  const nonces = new WeakMap<ServerResponse, string>();
  const writeHeaders = helmet(helmetOptions((_req, res) => nonces.get(res) ?? "", settings));
  return (req: IncomingMessage, res: ServerResponse, next: Next) => {
    const nonce = randomBytes(16).toString("base64");
    nonces.set(res, nonce);
    // Only ours: a nonce sent by the client is dropped.
    req.headers[NONCE_HEADER] = nonce;
    onHeaders(res, () => {
      writeHeaders(req, res, () => {});
      res.setHeader("Permissions-Policy", PERMISSIONS_POLICY);
    });
    const url = new URL(req.url ?? "/", "http://tidemark.invalid");
    const verdict = judgeBody(req.method ?? "GET", url.pathname, { contentLength: req.headers["content-length"], transferEncoding: req.headers["transfer-encoding"] });
    if (!verdict.ok) return refuse(res, url.pathname, verdict.status, verdict.message);
    next();
  };
}

/**
 * Answers without reading the body and closes the connection afterwards (RFC 9110 §15.5.14:
 * the server may close the connection to stop the client sending the rest).
 */
function refuse(res: ServerResponse, pathname: string, status: 411 | 413, message: string) {
  const api = pathname.startsWith("/api/");
  const body = api ? JSON.stringify({ error: { code: status === 413 ? "payload_too_large" : "length_required", message } }) : message;
  res.writeHead(status, {
    "Content-Type": api ? "application/json; charset=utf-8" : "text/plain; charset=utf-8",
    "Content-Length": Buffer.byteLength(body),
    "Cache-Control": "no-store",
    Connection: "close",
  });
  res.end(body);
}
