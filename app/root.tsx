import {

  isRouteErrorResponse,
  Links,
  Meta,
  Outlet,
  Scripts,
  ScrollRestoration,
  useRouteError,
} from "react-router";
import { sessionMiddleware } from "~/auth/gate.server";
import { ErrorPage } from "~/components/error-page";
import { backgroundJobs } from "~/jobs.server";
import { bodyLimit } from "~/security/body-limit.server";
import { useNonce } from "~/security/nonce";
import type { Route } from "./+types/root";
import "./styles/app.css";
import { z } from "zod";

// In the browser, zod must not probe whether it may compile parsers with `new Function`: the
// Content-Security-Policy forbids eval, and the caught probe is still reported as a violation.
if (typeof document !== "undefined") z.config({ jitless: true });

export const middleware: Route.MiddlewareFunction[] = [bodyLimit, backgroundJobs, sessionMiddleware];

export const links: Route.LinksFunction = () => [{ rel: "icon", href: "/favicon.svg", type: "image/svg+xml" }];

export function Layout({ children }: { children: React.ReactNode }) {
  const nonce = useNonce();
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <Meta />
        <Links />
      </head>
      <body className="min-h-screen bg-paper text-ink antialiased">
        {children}
        <ScrollRestoration nonce={nonce} />
        <Scripts nonce={nonce} />
      </body>
    </html>
  );
}

export default function App() {
  return <Outlet />;
}

export function ErrorBoundary() {
  const error = useRouteError();
  if (isRouteErrorResponse(error)) {
    const payload = typeof error.data === "object" && error.data ? (error.data as { message?: unknown; signedIn?: unknown }) : {};
    const message = typeof payload.message === "string" ? payload.message : undefined;
    return <ErrorPage status={error.status} message={message} signedIn={typeof payload.signedIn === "boolean" ? payload.signedIn : undefined} />;
  }
  if (import.meta.env.DEV && error instanceof Error) console.error(error);
  return <ErrorPage status={500} />;
}

