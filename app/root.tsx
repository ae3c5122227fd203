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
import type { Route } from "./+types/root";
import "./styles/app.css";

export const middleware: Route.MiddlewareFunction[] = [backgroundJobs, sessionMiddleware];

export const links: Route.LinksFunction = () => [{ rel: "icon", href: "/favicon.svg", type: "image/svg+xml" }];

export function Layout({ children }: { children: React.ReactNode }) {
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
        <ScrollRestoration />
        <Scripts />
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

