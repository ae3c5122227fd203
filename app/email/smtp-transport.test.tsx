// The SMTP transport against a real SMTP server started here (the smtp-server package):
// what a hospital's mail relay would receive from Tidemark.
import { createServer as createNetServer, type AddressInfo } from "node:net";
import { SMTPServer } from "smtp-server";
import { afterEach, describe, expect, it } from "vitest";
import SignInCodeEmail, { signInCodeSubject } from "../../emails/sign-in-code";
import { sendEmail, type MailSettings } from "./send-email.server";

type Received = { raw: string; mailFrom: string; rcptTo: string[] };

let relay: SMTPServer | undefined;
afterEach(async () => {
  await new Promise<void>((resolve) => (relay ? relay.close(() => resolve()) : resolve()));
  relay = undefined;
});

/** A relay on a free loopback port; `refuse` makes it answer 550 to this recipient. */
async function startRelay(received: Received[], refuse?: string): Promise<number> {
  relay = new SMTPServer({
    authOptional: true,
    // A plain-text loopback relay; STARTTLS with the server's self-signed default would fail verification.
    disabledCommands: ["STARTTLS"],
    logger: false,
    onRcptTo(address, _session, callback) {
      if (address.address === refuse) {
        return callback(Object.assign(new Error("Mailbox unavailable"), { responseCode: 550 }));
      }
      callback();
    },
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (chunk: Buffer) => chunks.push(chunk));
      stream.on("end", () => {
        received.push({
          raw: Buffer.concat(chunks).toString("utf8"),
          mailFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
          rcptTo: session.envelope.rcptTo.map((r) => r.address),
        });
        callback();
      });
    },
  });
  await new Promise<void>((resolve) => relay!.listen(0, "127.0.0.1", resolve));
  return (relay.server.address() as AddressInfo).port;
}

function settingsFor(port: number): MailSettings {
  return {
    mailTransport: "smtp",
    resendApiKey: "unused",
    resendBaseUrl: "http://127.0.0.1:1",
    smtpUrl: `smtp://127.0.0.1:${port}`,
    mailFrom: "Tidemark <no-reply@tidemark.test>",
  };
}

// --- a small MIME reader for the test (RFC 2045 transfer encodings, RFC 2046 multipart) ---

function splitHeaders(entity: string): { headers: Map<string, string>; body: string } {
  const cut = entity.indexOf("\r\n\r\n");
  const head = entity.slice(0, cut).replace(/\r\n[ \t]+/g, " "); // unfold continued lines
  const headers = new Map<string, string>();
  for (const line of head.split("\r\n")) {
    const colon = line.indexOf(":");
    headers.set(line.slice(0, colon).trim().toLowerCase(), line.slice(colon + 1).trim());
  }
  return { headers, body: entity.slice(cut + 4) };
}

function decode(body: string, encoding = "7bit"): string {
  if (/base64/i.test(encoding)) return Buffer.from(body.replace(/\s+/g, ""), "base64").toString("utf8");
  if (/quoted-printable/i.test(encoding)) {
    const bytes = body.replace(/=\r\n/g, "").replace(/=([0-9A-F]{2})/gi, (_m, hex: string) => String.fromCharCode(parseInt(hex, 16)));
    return Buffer.from(bytes, "latin1").toString("utf8");
  }
  return body;
}

function parts(raw: string): { headers: Map<string, string>; parts: Map<string, string> } {
  const { headers, body } = splitHeaders(raw);
  const boundary = /boundary="?([^";]+)"?/.exec(headers.get("content-type") ?? "")?.[1];
  const found = new Map<string, string>();
  if (boundary) {
    for (const section of body.split(`--${boundary}`).slice(1, -1)) {
      const part = splitHeaders(section.replace(/^\r\n/, ""));
      const type = (part.headers.get("content-type") ?? "").split(";")[0].trim();
      found.set(type, decode(part.body, part.headers.get("content-transfer-encoding")));
    }
  }
  return { headers, parts: found };
}

const props = { personName: "Sam Okafor", code: "905172", magicLink: "http://localhost:3000/login/verify?code=905172", expiresMinutes: 10 };

describe("sendEmail over SMTP", () => {
  it("delivers one message with the subject, recipient and both a text and an HTML part", async () => {
    const received: Received[] = [];
    const port = await startRelay(received);
    const result = await sendEmail(
      { to: "sam.okafor@kestrel.test", subject: signInCodeSubject(props), react: <SignInCodeEmail {...props} /> },
      { settings: settingsFor(port) },
    );

    expect(result.ok).toBe(true);
    expect(received).toHaveLength(1);
    const [mail] = received;
    expect(mail.mailFrom).toBe("no-reply@tidemark.test");
    expect(mail.rcptTo).toEqual(["sam.okafor@kestrel.test"]);

    const { headers, parts: found } = parts(mail.raw);
    expect(headers.get("subject")).toBe("Your Tidemark sign-in code");
    expect(headers.get("to")).toBe("sam.okafor@kestrel.test");
    expect(headers.get("from")).toBe("Tidemark <no-reply@tidemark.test>");
    if (result.ok) expect(headers.get("message-id")).toBe(result.id);
    expect(headers.get("content-type")).toMatch(/^multipart\/alternative/);
    expect([...found.keys()].sort()).toEqual(["text/html", "text/plain"]);
    expect(found.get("text/plain")).toContain("905172");
    expect(found.get("text/plain")).toContain("expire in 10 minutes");
    expect(found.get("text/plain")).not.toMatch(/<[a-z][^>]*>/i);
    expect(found.get("text/html")).toContain("905172");
    expect(found.get("text/html")).toContain('href="http://localhost:3000/login/verify?code=905172"');
  });

  it("the settings' transport can be overridden per message", async () => {
    const received: Received[] = [];
    const port = await startRelay(received);
    const result = await sendEmail(
      { to: "sam.okafor@kestrel.test", subject: signInCodeSubject(props), react: <SignInCodeEmail {...props} /> },
      { transport: "smtp", settings: { ...settingsFor(port), mailTransport: "resend" } },
    );
    expect(result.ok).toBe(true);
    expect(received).toHaveLength(1);
  });

  it("a recipient the relay refuses (550) comes back as rejected", async () => {
    const received: Received[] = [];
    const port = await startRelay(received, "gone@kestrel.test");
    const result = await sendEmail(
      { to: "gone@kestrel.test", subject: signInCodeSubject(props), react: <SignInCodeEmail {...props} /> },
      { settings: settingsFor(port) },
    );
    expect(result).toMatchObject({ ok: false, error: { kind: "rejected" } });
    expect(received).toHaveLength(0);
  });

  it("a relay that is not listening comes back as unreachable", async () => {
    // Take a free port and release it, so nothing listens there.
    const probe = createNetServer();
    await new Promise<void>((resolve) => probe.listen(0, "127.0.0.1", resolve));
    const port = (probe.address() as AddressInfo).port;
    await new Promise<void>((resolve) => probe.close(() => resolve()));

    const result = await sendEmail(
      { to: "sam.okafor@kestrel.test", subject: signInCodeSubject(props), react: <SignInCodeEmail {...props} /> },
      { settings: settingsFor(port) },
    );
    expect(result).toMatchObject({ ok: false, error: { kind: "unreachable" } });
  });
});
