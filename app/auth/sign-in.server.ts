import { compactDecrypt } from "jose";
import { createCookie, redirect } from "react-router";
import { TOTPStrategy } from "remix-auth-totp";
import { createElement } from "react";
import { env } from "~/config/env.server";
import { sendEmail } from "~/email/send-email.server";
import SignInCodeEmail, { signInCodeSubject } from "../../emails/sign-in-code";
import { clientKey } from "./rate-limit.server";
import { startSession } from "./session.server";
import {
  checkCode,
  findActivePersonByEmail,
  normaliseEmail,
  recordIssuedCode,
  type CodeCheck,
} from "./sign-in-codes.server";

export const MAGIC_LINK_PATH = "/login/magic";

/** Points this browser at its own sign-in code record (signed; the record itself is server-side). */
let signInCookie: ReturnType<typeof createCookie> | undefined;
/**
 * The pointer outlives the code by this much, so a code typed after its lifetime is answered
 * "This code has expired" (from the server's record) rather than "no code request from this
 * browser". Expiry itself is enforced on the server record, never by the cookie's lifetime.
 */
const PENDING_POINTER_GRACE_SECONDS = 60 * 60;
export function pendingSignInCookie() {
  const e = env();
  signInCookie ??= createCookie("tm_signin", {
    httpOnly: true,
    sameSite: "lax",
    path: "/login",
    secure: e.production,
    secrets: [e.sessionSecret],
    maxAge: e.signInCodeTtlSeconds + PENDING_POINTER_GRACE_SECONDS,
  });
  return signInCookie;
}

export async function readPendingSignIn(request: Request): Promise<string | null> {
  const value = await pendingSignInCookie().parse(request.headers.get("Cookie"));
  return typeof value === "string" ? value : null;
}

// Hand-offs between our route code and the strategy's callbacks for one request.
const issuedFor = new WeakMap<Request, string>();
const verifiedFor = new WeakMap<Request, Extract<CodeCheck, { ok: true }>["record"]>();

/**
 * The remix-auth TOTP strategy, called directly rather than through remix-auth's Authenticator:
 * the Authenticator hands the strategy a copy of the Request, and our hand-offs above are keyed
 * by the request object itself.
 */
let strategy: TOTPStrategy<never> | undefined;
function getStrategy() {
  if (strategy) return strategy;
  const e = env();
  strategy = new TOTPStrategy<never>(
      {
        secret: e.totpSecret,
        magicLinkPath: MAGIC_LINK_PATH,
        emailSentRedirect: "/login/code",
        successRedirect: "/today",
        failureRedirect: "/login/code",
        cookieOptions: { ...(e.production ? { secure: true as const } : {}), httpOnly: true, sameSite: "Lax", path: "/", maxAge: e.signInCodeTtlSeconds },
        // Six digits are quick to type from a phone's mail into a shared workstation.
        totpGeneration: { period: e.signInCodeTtlSeconds, digits: 6, charSet: "0123456789", maxAttempts: 3 },
        validateEmail: async (email) => /^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(email),
        sendTOTP: async ({ email, code, magicLink, request }) => {
          const person = await findActivePersonByEmail(email);
          const record = await recordIssuedCode({ email, code, personId: person?.id ?? null, clientKey: clientKey(request) });
          issuedFor.set(request, record.id);
          // Unknown or inactive address: same screens, but no mail and (later) no session.
          if (!person) return;
          const result = await sendEmail({
            to: normaliseEmail(email),
            subject: signInCodeSubject(),
            react: createElement(SignInCodeEmail, {
              personName: person.name,
              code,
              magicLink,
              expiresMinutes: Math.max(1, Math.round(e.signInCodeTtlSeconds / 60)),
            }),
          });
          if (!result.ok) console.warn(`Sign-in code e-mail not sent: ${result.error.kind}: ${result.error.message}`);
        },
      },
      async ({ email, request }) => {
        const record = verifiedFor.get(request);
        if (!record || normaliseEmail(email) !== record.email) {
          throw new Error("This code does not belong to that address. Ask for a new code.");
        }
        const person = await findActivePersonByEmail(record.email);
        if (!person) throw new Error("This account cannot sign in. Ask your administrator.");
        const cookie = await startSession(person.id, person.orgId, request);
        const headers = new Headers();
        headers.append("Set-Cookie", cookie);
        headers.append("Set-Cookie", await pendingSignInCookie().serialize("", { maxAge: 0 }));
        throw redirect("/today", { headers });
      },
  );
  return strategy;
}

/** Runs the strategy; it always answers with a redirect, which we return with our cookie added. */
async function runStrategy(request: Request): Promise<Response> {
  try {
    await getStrategy().authenticate(request);
  } catch (thrown) {
    if (thrown instanceof Response) {
      const issued = issuedFor.get(request);
      if (issued) {
        const headers = new Headers(thrown.headers);
        headers.append("Set-Cookie", await pendingSignInCookie().serialize(issued));
        return new Response(null, { status: thrown.status, headers });
      }
      return thrown;
    }
    throw thrown;
  }
  throw new Error("The sign-in strategy returned without a redirect.");
}

/** POST /login with a valid e-mail: issue a code (and mail it if the address is known). */
export async function requestCode(request: Request): Promise<Response> {
  return runStrategy(request);
}

/** POST /login/code or GET /login/magic: our own check first, then the strategy's. */
export async function redeemCode(request: Request, code: string): Promise<CodeCheck | Response> {
  const check = await checkCode(await readPendingSignIn(request), code);
  if (!check.ok) return check;
  verifiedFor.set(request, check.record);
  return runStrategy(request);
}

/** The code inside a magic link (the strategy encrypts it with our TOTP secret). */
export async function codeFromMagicLink(token: string): Promise<string | null> {
  try {
    const key = Uint8Array.from(Buffer.from(env().totpSecret, "hex"));
    const { plaintext } = await compactDecrypt(token, key);
    const params = JSON.parse(new TextDecoder().decode(plaintext)) as { code?: unknown };
    return typeof params.code === "string" ? params.code : null;
  } catch {
    return null;
  }
}

/** The strategy's last error message, kept in its own cookie. */
export function strategyError(request: Request): string | null {
  const raw = request.headers.get("Cookie")?.split(/;\s*/).find((c) => c.startsWith("_totp="));
  if (!raw) return null;
  try {
    return new URLSearchParams(decodeURIComponent(raw.slice("_totp=".length))).get("error");
  } catch {
    return null;
  }
}
