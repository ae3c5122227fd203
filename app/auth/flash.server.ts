import { createCookie, redirect } from "react-router";
import { env } from "~/config/env.server";

/** A one-time message shown after a redirect ("Unit added."), read once by the shell. */
let cookie: ReturnType<typeof createCookie> | undefined;
function flashCookie() {
  cookie ??= createCookie("tm_flash", {
    httpOnly: true,
    sameSite: "lax",
    path: "/",
    secure: env().production,
    secrets: [env().sessionSecret],
    maxAge: 60,
  });
  return cookie;
}

export async function redirectWithToast(to: string, message: string, init: ResponseInit = {}): Promise<never> {
  const headers = new Headers(init.headers);
  headers.append("Set-Cookie", await flashCookie().serialize(message));
  throw redirect(to, { ...init, headers });
}

/** The pending message, and the header that clears it. */
export async function readToast(request: Request): Promise<{ toast: string | null; headers: HeadersInit | undefined }> {
  const value = await flashCookie().parse(request.headers.get("Cookie"));
  if (typeof value !== "string" || !value) return { toast: null, headers: undefined };
  return { toast: value, headers: { "Set-Cookie": await flashCookie().serialize("", { maxAge: 0 }) } };
}
