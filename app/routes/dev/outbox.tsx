import { useLoaderData } from "react-router";
import { notFound } from "~/auth/gate.server";
import { ProductMark } from "~/components/product-mark";
import { env } from "~/config/env.server";
import type { Route } from "./+types/outbox";

type OutboxMessage = { id: string; to: string[]; subject: string; text?: string; html?: string; created_at: string };

/** Demo mode only: what the local e-mail fake has received, newest first. */
export async function loader(_: Route.LoaderArgs) {
  const e = env();
  if (!e.demoMode) notFound();
  try {
    const res = await fetch(`${e.resendBaseUrl}/emails`, { headers: { Authorization: `Bearer ${e.resendApiKey}` } });
    const body = (await res.json()) as { data: OutboxMessage[] };
    return { messages: body.data.slice(0, 50), error: null as string | null, fakeUrl: e.resendBaseUrl };
  } catch {
    return { messages: [] as OutboxMessage[], error: `The local e-mail fake at ${e.resendBaseUrl} is not answering.`, fakeUrl: e.resendBaseUrl };
  }
}

export default function Outbox() {
  const { messages, error, fakeUrl } = useLoaderData<typeof loader>();
  return (
    <div className="mx-auto max-w-3xl px-4 py-8">
      <ProductMark />
      <main id="main">
        <h1 className="mt-6 text-3xl font-semibold">Demo outbox</h1>
        <p className="text-muted">
          Every e-mail Tidemark sends in demo mode lands here instead of a real mailbox (served by the local fake at {fakeUrl}). Newest first.
        </p>
        {error ? (
          <p role="alert" className="mt-4 rounded-md border-l-4 border-coral bg-coral-wash px-4 py-3">
            {error}
          </p>
        ) : null}
        {messages.length === 0 && !error ? <p className="mt-6">No messages yet. Ask for a sign-in code and it will appear here.</p> : null}
        <ol className="mt-6 flex flex-col gap-4">
          {messages.map((m) => (
            <li key={m.id} className="rounded-lg border border-rule bg-card p-4">
              <h2 className="text-lg font-semibold">{m.subject}</h2>
              <p className="text-sm text-muted">
                To {m.to.join(", ")} · <time dateTime={m.created_at}>{new Date(m.created_at).toLocaleString("en-US")}</time>
              </p>
              <pre className="mt-3 font-sans text-base whitespace-pre-wrap">{m.text}</pre>
            </li>
          ))}
        </ol>
      </main>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Demo outbox · Tidemark" }];
