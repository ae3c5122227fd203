import { Form, Link } from "react-router";
import { ProductMark } from "./product-mark";

const COPY: Record<number, { title: string; body: string }> = {
  403: {
    title: "This page is not part of your roles",
    body: "Tidemark shows each person the sections their roles use. If you need this page, ask your department's administrator to add the role.",
  },
  404: {
    title: "We could not find that page",
    body: "The address may be mistyped, or the record may have been moved or retired.",
  },
  413: { title: "That upload is too large", body: "Choose a smaller file and try again." },
  500: {
    title: "Something went wrong on our side",
    body: "Nothing you saved before this point is lost. Try again in a moment; if it keeps happening, tell your administrator the time it happened.",
  },
};

export function ErrorPage({ status, message, signedIn }: { status: number; message?: string; signedIn?: boolean }) {
  const copy = COPY[status] ?? { title: `Error ${status}`, body: "This request could not be completed." };
  return (
    <main id="main" className="mx-auto flex min-h-screen max-w-xl flex-col justify-center gap-4 px-6 py-16">
      <title>{`${copy.title} · Tidemark`}</title>
      <ProductMark />
      <p className="text-sm font-semibold tracking-wide text-coral uppercase">Error {status}</p>
      <h1 className="text-3xl font-semibold">{copy.title}</h1>
      {message ? <p className="text-lg">{message}</p> : null}
      <p className="text-muted">{copy.body}</p>
      <div className="flex flex-wrap items-center gap-4">
        <Link to={signedIn === false ? "/login" : "/today"} className="font-semibold">
          {signedIn === false ? "Sign in" : "Go to Today"}
        </Link>
        {signedIn ? (
          <Form method="post" action="/logout">
            <button type="submit" className="min-h-11 rounded-md px-3 font-semibold text-sea underline underline-offset-2 hover:bg-sea-wash">
              Sign out
            </button>
          </Form>
        ) : null}
      </div>
    </main>
  );
}
