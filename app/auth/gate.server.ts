import { data, redirect, type MiddlewareFunction, type RouterContextProvider } from "react-router";
import { viewerContext, type Viewer } from "./context";
import { can, type Permission } from "./roles";
import { clearSessionCookie, getSession, SESSION_COOKIE_NAME } from "./session.server";

/** Error payloads say whether someone is signed in, so our error page can offer sign-out. */
export type ErrorPayload = { message: string; signedIn?: boolean };

/** A 403 is only ever answered to a signed-in person (anonymous visitors are sent to sign in). */
export function forbidden(message = "Your roles do not include this page."): never {
  throw data({ message, signedIn: true } satisfies ErrorPayload, { status: 403 });
}

export function notFound(message = "We could not find that page.", signedIn = false): never {
  throw data({ message, signedIn } satisfies ErrorPayload, { status: 404 });
}

function signInRedirect(request: Request): never {
  const url = new URL(request.url);
  // A client data request (`/x.data?_routes=…&person=…`) comes back to its page (`/x?person=…`):
  // only React Router's own parameter is dropped, and the rest keeps its leading "?".
  const query = new URLSearchParams(url.search);
  query.delete("_routes");
  const search = query.toString();
  const next = url.pathname.replace(/\.data$/, "") + (search ? `?${search}` : "");
  throw redirect(`/login?next=${encodeURIComponent(next)}`);
}

/**
 * Cross-site request refusal (OWASP ASVS 4.0.3 V4.2.2). React Router checks UI actions but
 * skips resource routes and requests with no Origin, so every non-GET request that carries
 * our session cookie must prove it came from a Tidemark page.
 */
export function isSameOriginRequest(request: Request, publicUrl?: string): boolean {
  const site = request.headers.get("Sec-Fetch-Site");
  const origin = request.headers.get("Origin");
  const own = new Set([new URL(request.url).origin]);
  if (publicUrl) own.add(new URL(publicUrl).origin);
  if (origin) return own.has(origin);
  return site === "same-origin";
}

function carriesSessionCookie(request: Request): boolean {
  return (request.headers.get("Cookie") ?? "").split(/;\s*/).some((c) => c.startsWith(`${SESSION_COOKIE_NAME}=`));
}

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/** Root middleware: refuses cross-site writes, loads the viewer, clears a bad session cookie. */
export const sessionMiddleware: MiddlewareFunction<Response> = async ({ request, context }, next) => {
  if (!SAFE_METHODS.has(request.method) && carriesSessionCookie(request) && !isSameOriginRequest(request, process.env.PUBLIC_URL)) {
    throw data({ message: "This request did not come from a Tidemark page, so it was refused." }, { status: 403 });
  }
  const { viewer, hadCookie } = await getSession(request);
  context.set(viewerContext, viewer);
  const response = await next();
  if (hadCookie && !viewer) response.headers.append("Set-Cookie", await clearSessionCookie());
  return response;
};

/** Layout middleware: signed in, and holding the section's permission. Deny by default. */
export function gate(permission?: Permission): MiddlewareFunction<Response> {
  return async ({ request, context }, next) => {
    const viewer = context.get(viewerContext);
    if (!viewer) signInRedirect(request);
    if (permission && !can(viewer.roles, permission)) forbidden();
    return next();
  };
}

/** For loaders and actions behind a gate: the viewer, re-checked. */
export function requireViewer(context: Readonly<RouterContextProvider>, permission?: Permission): Viewer {
  const viewer = context.get(viewerContext);
  if (!viewer) throw redirect("/login");
  if (permission && !can(viewer.roles, permission)) forbidden();
  return viewer;
}
