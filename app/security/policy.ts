/**
 * Tidemark's response-header and request-size policy, in one place. Pure: the production
 * server (scripts/serve.mjs, through app/security/server.ts) applies it to every response —
 * documents, data requests, resource routes, static assets, 404s and 500s — and the tests
 * read the same values.
 *
 * Sources: W3C Content Security Policy Level 3 (Working Draft, 2024) for the directives and
 * nonces; OWASP Secure Headers Project (2024) and OWASP ASVS 4.0.3 V14.4 (HTTP security
 * headers) for the set; RFC 6797 (2012) for Strict-Transport-Security; RFC 9110 §15.5.14
 * (2022) for 413 Content Too Large.
 */
import type { IncomingMessage, ServerResponse } from "node:http";
import type { HelmetOptions } from "helmet";

export type PolicySettings = {
  /** NODE_ENV=production: HSTS is sent (browsers honour it only over HTTPS, RFC 6797 §8.1). */
  production: boolean;
  /** The public address is https: mixed content is upgraded (never on a plain-http loopback). */
  https: boolean;
};

/** A nonce, or a function giving the nonce of the response being answered. */
export type NonceSource = string | ((req: IncomingMessage, res: ServerResponse) => string);

/**
 * The Content-Security-Policy directives for one response. Scripts and style elements run only
 * from our own origin or with this response's nonce; inline event handlers never; style
 * attributes are allowed (React's style prop and the waveform plot use them; they cannot run
 * code). No framing by anyone (clickjacking, W3C CSP3 §6.4.2 frame-ancestors).
 */
export function cspDirectives(nonce: NonceSource, settings: Pick<PolicySettings, "https">): Record<string, NonceSource[] | null> {
  const n: NonceSource = typeof nonce === "string" ? `'nonce-${nonce}'` : (req, res) => `'nonce-${nonce(req, res)}'`;
  return {
    "default-src": ["'self'"],
    "base-uri": ["'none'"],
    "object-src": ["'none'"],
    "frame-ancestors": ["'none'"],
    "frame-src": ["'none'"],
    "form-action": ["'self'"],
    "script-src": ["'self'", n],
    "script-src-attr": ["'none'"],
    "style-src": ["'self'", n],
    "style-src-attr": ["'unsafe-inline'"],
    // data: for the status shapes drawn by the stylesheet; blob: for previews of a chosen scan.
    "img-src": ["'self'", "data:", "blob:"],
    "font-src": ["'self'"],
    "connect-src": ["'self'"],
    "manifest-src": ["'self'"],
    "worker-src": ["'none'"],
    "upgrade-insecure-requests": settings.https ? [] : null,
  };
}

/** The whole header set as helmet options (helmet 8 writes each header). */
export function helmetOptions(nonce: NonceSource, settings: PolicySettings): HelmetOptions {
  return {
    contentSecurityPolicy: { useDefaults: false, directives: cspDirectives(nonce, settings) },
    // Strict: no address (with its ids or certificate codes) leaves for another origin in a
    // Referer header. Not "no-referrer": under it a browser sends `Origin: null` on our own form
    // posts (Fetch standard, "serializing a request origin"), which the cross-site check refuses.
    referrerPolicy: { policy: "same-origin" },
    strictTransportSecurity: settings.production ? { maxAge: 31_536_000, includeSubDomains: true } : false,
    xFrameOptions: { action: "deny" },
    xContentTypeOptions: true,
    crossOriginOpenerPolicy: { policy: "same-origin" },
    crossOriginResourcePolicy: { policy: "same-origin" },
    // Cross-origin isolation would refuse nothing we load, but buys nothing either.
    crossOriginEmbedderPolicy: false,
    originAgentCluster: true,
    xDnsPrefetchControl: { allow: false },
    xPermittedCrossDomainPolicies: { permittedPolicies: "none" },
    xDownloadOptions: true,
    xXssProtection: true,
    xPoweredBy: true,
  };
}

/** Features no Tidemark page uses, switched off for the page and anything it might embed. */
export const PERMISSIONS_POLICY = "camera=(), microphone=(), geolocation=(), payment=(), usb=(), interest-cohort=()";

// ── Request bodies ─────────────────────────────────────────────────────────────────────────
const MB = 1024 * 1024;

/**
 * The largest request body each address takes, checked from Content-Length before a byte is
 * read. Each upload route's own, friendlier check (a message beside the file field) sits below
 * its limit here; this one stops anything beyond it. Everything else — forms, answer saves,
 * the JSON API — takes at most 1 MB.
 */
export const BODY_LIMITS: readonly { pattern: RegExp; bytes: number; why: string }[] = [
  { pattern: /^\/credentials\/?$/, bytes: 26 * MB, why: "a credential with a front and a back scan, each up to 10 MB" },
  { pattern: /^\/checkoffs\/[^/]+\/?$/, bytes: 11 * MB, why: "one evidence file up to 10 MB" },
  { pattern: /^\/admin\/roster\/?$/, bytes: 5 * MB, why: "a roster file up to 2 MB" },
  { pattern: /^\/bank\/import\/?$/, bytes: 3 * MB, why: "a question file up to 1 MB" },
];
export const DEFAULT_BODY_LIMIT = 1 * MB;

/** The body limit for a request path (a client data request's `.data` suffix is ignored). */
export function bodyLimitFor(pathname: string): number {
  const path = pathname.replace(/\.data$/, "");
  return BODY_LIMITS.find((l) => l.pattern.test(path))?.bytes ?? DEFAULT_BODY_LIMIT;
}

export type BodyVerdict = { ok: true } | { ok: false; status: 411 | 413; message: string };

/**
 * Whether a request's body may be read. A body without a declared length (chunked) is refused
 * with 411: browsers always send Content-Length for forms and fetches, and a declared length is
 * what lets an oversize body be refused before it is read.
 */
export function judgeBody(method: string, pathname: string, headers: { contentLength: string | null | undefined; transferEncoding: string | null | undefined }): BodyVerdict {
  if (method === "GET" || method === "HEAD" || method === "OPTIONS") return { ok: true };
  const limit = bodyLimitFor(pathname);
  if (headers.contentLength == null || headers.contentLength === "") {
    if (headers.transferEncoding) return { ok: false, status: 411, message: "Send the request with a Content-Length." };
    return { ok: true };
  }
  const length = Number(headers.contentLength);
  if (!Number.isSafeInteger(length) || length < 0) return { ok: false, status: 413, message: "The request's Content-Length is not a size." };
  if (length > limit) {
    return { ok: false, status: 413, message: `The request is ${(length / MB).toFixed(1)} MB; this address takes at most ${Math.round(limit / MB)} MB.` };
  }
  return { ok: true };
}
