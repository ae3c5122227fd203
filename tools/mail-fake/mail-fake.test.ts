// The fake's contract, driven by the real Resend SDK (TESTING.md: "e-mail — the real Resend
// SDK sending to our fake"). If a later SDK changes its request or response shapes, this fails.
import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { Resend } from "resend";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { startMailFake, type MailFake } from "./mail-fake";

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

let dataDir: string;
let fake: MailFake | undefined;

beforeEach(() => {
  dataDir = mkdtempSync(path.join(tmpdir(), "tidemark-mail-fake-"));
});
afterEach(async () => {
  await fake?.close();
  fake = undefined;
  rmSync(dataDir, { recursive: true, force: true });
});

type Listed = { id: string; from: string; to: string[]; subject: string; html: string | null; text: string | null; created_at: string };

async function listEmails(url: string): Promise<Listed[]> {
  const response = await fetch(`${url}/emails`);
  expect(response.status).toBe(200);
  expect(response.headers.get("content-type")).toMatch(/^application\/json/);
  return ((await response.json()) as { data: Listed[] }).data;
}

describe("mail fake, driven by the Resend SDK", () => {
  it("accepts two messages, lists them newest first, keeps them as files and across a restart", async () => {
    fake = await startMailFake({ port: 0, dataDir });
    const resend = new Resend("re_test_key", { baseUrl: fake.url });

    const first = await resend.emails.send({
      from: "Tidemark <no-reply@tidemark.test>",
      to: "ana.reyes@kestrel.test",
      subject: "First message",
      html: "<p>Code <strong>111111</strong></p>",
      text: "Code 111111",
    });
    const second = await resend.emails.send({
      from: "Tidemark <no-reply@tidemark.test>",
      to: ["sam.okafor@kestrel.test", "lee.tran@kestrel.test"],
      cc: "educator@kestrel.test",
      replyTo: "help@kestrel.test",
      subject: "Second message",
      html: "<p>Code 222222</p>",
      text: "Code 222222",
      tags: [{ name: "kind", value: "sign-in" }],
    });
    expect(first.error).toBeNull();
    expect(second.error).toBeNull();
    expect(first.data?.id).toMatch(UUID);
    expect(second.data?.id).toMatch(UUID);

    const listed = await listEmails(fake.url);
    expect(listed.map((m) => m.id)).toEqual([second.data?.id, first.data?.id]);
    expect(listed[0]).toMatchObject({
      from: "Tidemark <no-reply@tidemark.test>",
      to: ["sam.okafor@kestrel.test", "lee.tran@kestrel.test"],
      subject: "Second message",
      html: "<p>Code 222222</p>",
      text: "Code 222222",
      cc: ["educator@kestrel.test"],
      reply_to: ["help@kestrel.test"],
    });
    // A single recipient string is listed as a one-element array, like the service does.
    expect(listed[1].to).toEqual(["ana.reyes@kestrel.test"]);
    for (const message of listed) expect(new Date(message.created_at).toISOString()).toBe(message.created_at);
    expect(listed[0].created_at > listed[1].created_at).toBe(true);

    // One JSON file per message, names sorting in sending order.
    const files = readdirSync(path.join(dataDir, "outbox")).sort();
    expect(files).toHaveLength(2);
    expect(files[0]).toMatch(new RegExp(`^\\d{4}-\\d{2}-\\d{2}T.*_${first.data?.id}\\.json$`));
    expect(JSON.parse(readFileSync(path.join(dataDir, "outbox", files[1]), "utf8")).subject).toBe("Second message");

    // The SDK's own read call understands the fake's answer.
    const fetched = await resend.emails.get(first.data!.id);
    expect(fetched.error).toBeNull();
    expect(fetched.data).toMatchObject({ id: first.data?.id, subject: "First message", to: ["ana.reyes@kestrel.test"] });

    await fake.close();
    fake = await startMailFake({ port: 0, dataDir });
    expect(fake.messages().map((m) => m.subject)).toEqual(["Second message", "First message"]);

    const third = await new Resend("re_test_key", { baseUrl: fake.url }).emails.send({
      from: "Tidemark <no-reply@tidemark.test>",
      to: "ana.reyes@kestrel.test",
      subject: "After the restart",
      text: "Code 333333",
    });
    expect(third.error).toBeNull();
    expect((await listEmails(fake.url)).map((m) => m.subject)).toEqual(["After the restart", "Second message", "First message"]);
  });

  it("refuses a request without an API key with the service's 401 error shape", async () => {
    fake = await startMailFake({ port: 0, dataDir });
    const response = await fetch(`${fake.url}/emails`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ from: "a@tidemark.test", to: "b@tidemark.test", subject: "x", text: "x" }),
    });
    expect(response.status).toBe(401);
    expect(await response.json()).toMatchObject({ statusCode: 401, name: "missing_api_key", message: expect.stringMatching(/API key/) });
    expect(fake.messages()).toHaveLength(0);
  });

  it("a refused key comes back from the SDK as an error value, not a throw", async () => {
    fake = await startMailFake({ port: 0, dataDir, apiKey: "re_the_right_key" });
    const result = await new Resend("re_a_wrong_key", { baseUrl: fake.url }).emails.send({
      from: "a@tidemark.test",
      to: "b@tidemark.test",
      subject: "x",
      text: "x",
    });
    expect(result.data).toBeNull();
    expect(result.error).toMatchObject({ statusCode: 403, name: "invalid_api_key" });
    expect(fake.messages()).toHaveLength(0);
  });

  it.each([
    ["from", { from: "", to: "b@tidemark.test", subject: "x" }],
    ["to", { from: "a@tidemark.test", to: [], subject: "x" }],
    ["subject", { from: "a@tidemark.test", to: "b@tidemark.test", subject: "" }],
  ])("answers 422 naming the missing `%s` field", async (field, fields) => {
    fake = await startMailFake({ port: 0, dataDir });
    const result = await new Resend("re_test_key", { baseUrl: fake.url }).emails.send({ ...fields, text: "x" });
    expect(result.error).toMatchObject({ statusCode: 422, name: "missing_required_field" });
    expect(result.error?.message).toContain(`\`${field}\``);
    expect(fake.messages()).toHaveLength(0);
  });

  it("is append-only: DELETE is refused and the messages stay; unknown ids are 404", async () => {
    fake = await startMailFake({ port: 0, dataDir });
    await new Resend("re_test_key", { baseUrl: fake.url }).emails.send({
      from: "a@tidemark.test",
      to: "b@tidemark.test",
      subject: "Keep me",
      text: "x",
    });
    const id = fake.messages()[0].id;
    for (const target of ["/emails", `/emails/${id}`]) {
      const response = await fetch(`${fake.url}${target}`, { method: "DELETE", headers: { authorization: "Bearer re_test_key" } });
      expect(response.status).toBe(405);
      expect(await response.json()).toMatchObject({ statusCode: 405, name: "method_not_allowed" });
    }
    expect(await listEmails(fake.url)).toHaveLength(1);
    expect(readdirSync(path.join(dataDir, "outbox"))).toHaveLength(1);

    const missing = await fetch(`${fake.url}/emails/00000000-0000-4000-8000-000000000000`);
    expect(missing.status).toBe(404);
    expect(await missing.json()).toMatchObject({ statusCode: 404, name: "not_found" });
  });
});
