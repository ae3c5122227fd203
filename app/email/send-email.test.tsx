// sendEmail through the Resend SDK, with msw intercepting the SDK's request to the real
// service address: what the SDK puts on the wire, and how each failure comes back typed.
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import SignInCodeEmail, { signInCodeSubject } from "../../emails/sign-in-code";
import { sendEmail, type MailSettings } from "./send-email.server";

const SERVICE = "https://api.resend.com";
const settings: MailSettings = {
  mailTransport: "resend",
  resendApiKey: "re_unit_test_key",
  resendBaseUrl: SERVICE,
  smtpUrl: "smtp://127.0.0.1:1",
  mailFrom: "Tidemark <no-reply@tidemark.test>",
};

const seen: { body: Record<string, unknown>; authorization: string | null }[] = [];
const server = setupServer();

beforeAll(() => server.listen({ onUnhandledRequest: "error" }));
afterEach(() => {
  server.resetHandlers();
  seen.length = 0;
});
afterAll(() => server.close());

function answer(respond: () => Response) {
  server.use(
    http.post(`${SERVICE}/emails`, async ({ request }) => {
      seen.push({ body: (await request.json()) as Record<string, unknown>, authorization: request.headers.get("authorization") });
      return respond();
    }),
  );
}

const props = { personName: "Ana Reyes", code: "482913", magicLink: "http://localhost:3000/login/verify?code=482913", expiresMinutes: 10 };
const message = { to: "ana.reyes@kestrel.test", subject: signInCodeSubject(props), react: <SignInCodeEmail {...props} /> };

describe("sendEmail through the Resend SDK", () => {
  it("sends the rendered template as the SDK's JSON body and returns the service's id", async () => {
    answer(() => HttpResponse.json({ id: "4ef9a417-02e9-4d39-ad75-9611e0fcc33c" }));
    const result = await sendEmail(message, { settings });

    expect(result).toEqual({ ok: true, id: "4ef9a417-02e9-4d39-ad75-9611e0fcc33c" });
    expect(seen).toHaveLength(1);
    const { body, authorization } = seen[0];
    expect(authorization).toBe("Bearer re_unit_test_key");
    expect(body).toMatchObject({ from: "Tidemark <no-reply@tidemark.test>", to: ["ana.reyes@kestrel.test"], subject: "Your Tidemark sign-in code" });
    expect(body.html).toEqual(expect.stringContaining("482913"));
    expect(body.html).toEqual(expect.stringContaining('href="http://localhost:3000/login/verify?code=482913"'));
    expect(body.text).toEqual(expect.stringContaining("482913"));
    expect(body.text).not.toMatch(/<[a-z][^>]*>/i);
  });

  it.each([
    { kind: "unreachable", case: "a server error (500)", respond: () => HttpResponse.json({ statusCode: 500, name: "internal_server_error", message: "boom" }, { status: 500 }) },
    { kind: "unreachable", case: "a server error page that is not JSON", respond: () => new HttpResponse("<html>Bad gateway</html>", { status: 502 }) },
    { kind: "unreachable", case: "the network failing", respond: () => HttpResponse.error() },
    { kind: "invalid", case: "a validation error (422)", respond: () => HttpResponse.json({ statusCode: 422, name: "validation_error", message: "Invalid `to` field." }, { status: 422 }) },
    { kind: "rejected", case: "a refused key (403)", respond: () => HttpResponse.json({ statusCode: 403, name: "invalid_api_key", message: "API key is invalid" }, { status: 403 }) },
    { kind: "rejected", case: "a rate limit (429)", respond: () => HttpResponse.json({ statusCode: 429, name: "rate_limit_exceeded", message: "Too many requests" }, { status: 429 }) },
  ] as const)("returns ok: false, kind $kind, for $case — without throwing", async ({ respond, kind }) => {
    answer(respond);
    const result = await sendEmail(message, { settings });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.error.kind).toBe(kind);
    expect(result.error.message).not.toBe("");
    expect(seen).toHaveLength(1);
  });

  it.each([
    ["an address without a domain", { to: "ana.reyes" }],
    ["an address with a header break", { to: "ana@kestrel.test\r\nBcc: x@evil.test" }],
    ["no recipient", { to: [] as string[] }],
    ["an empty subject", { subject: "  " }],
    ["a two-line subject", { subject: "Hello\r\nBcc: x@evil.test" }],
  ])("refuses %s as invalid before anything is sent", async (_case, change) => {
    answer(() => HttpResponse.json({ id: "never" }));
    const result = await sendEmail({ ...message, ...change }, { settings });
    expect(result).toMatchObject({ ok: false, error: { kind: "invalid" } });
    expect(seen).toHaveLength(0);
  });

  it("reports a missing API key as rejected (the SDK's constructor would throw)", async () => {
    answer(() => HttpResponse.json({ id: "never" }));
    const result = await sendEmail(message, { settings: { ...settings, resendApiKey: "" } });
    expect(result).toMatchObject({ ok: false, error: { kind: "rejected", message: expect.stringContaining("RESEND_API_KEY") } });
    expect(seen).toHaveLength(0);
  });
});
