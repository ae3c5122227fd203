import { render, toPlainText } from "@react-email/render";
import type { ReactElement } from "react";
import { env, type Env } from "../config/env.server";
import { sendWithResend } from "./resend-transport.server";
import { sendWithSmtp } from "./smtp-transport.server";

/**
 * The one way Tidemark sends e-mail. Callers pass a template element from `emails/`;
 * this renders its HTML and text versions and hands them to the configured transport:
 * the Resend SDK (pointed at the local fake in development and demo) or SMTP through
 * nodemailer, for hospitals that must send through their own mail relay.
 */
export type EmailMessage = {
  to: string | string[];
  subject: string;
  /** A template element from `emails/`, e.g. `<SignInCodeEmail … />`. */
  react: ReactElement;
};

export type MailTransport = Env["mailTransport"];
export type MailSettings = Pick<Env, "mailTransport" | "resendApiKey" | "resendBaseUrl" | "smtpUrl" | "mailFrom">;

export type SendEmailOptions = {
  /** Overrides `MAIL_TRANSPORT` for this message. */
  transport?: MailTransport;
  /** Complete mail settings; when given, the process environment is not read (tests). */
  settings?: MailSettings;
};

/**
 * - `invalid`: the message itself is wrong (bad address, empty subject, the service's 400/422) — do not retry.
 * - `rejected`: the service or relay refused it (key, quota, rate limit, refused recipient).
 * - `unreachable`: no answer, or a server error (network, 5xx, relay down) — worth retrying later.
 */
export type SendEmailError = { kind: "rejected" | "unreachable" | "invalid"; message: string };
export type SendEmailResult = { ok: true; id: string } | { ok: false; error: SendEmailError };

/** A rendered message, ready for a transport. */
export type OutgoingEmail = { from: string; to: string[]; subject: string; html: string; text: string };

// Deliberately plain: one @, no spaces, a dot in the domain. Real validation is the relay's job;
// this stops form mistakes and header injection (CR/LF) before anything leaves the process.
const ADDRESS = /^[^\s@<>",;]+@[^\s@<>",;]+\.[^\s@<>",;]+$/;

/**
 * Never throws for a failed send — the result says what went wrong. Only a programming error
 * (a template that cannot render) throws.
 */
export async function sendEmail(message: EmailMessage, options: SendEmailOptions = {}): Promise<SendEmailResult> {
  const settings = options.settings ?? pickMailSettings(env());
  const to = (Array.isArray(message.to) ? message.to : [message.to]).map((a) => a.trim());
  if (to.length === 0) return invalid("There is no recipient.");
  const bad = to.find((address) => !ADDRESS.test(address));
  if (bad !== undefined) return invalid(`"${bad}" is not an e-mail address.`);
  const subject = message.subject.trim();
  if (!subject || /[\r\n]/.test(subject)) return invalid("The subject must be one non-empty line.");

  // One render: the text version is the HTML converted as `render(…, { plainText: true })`
  // converts it (the same function, the same selectors), without rendering the template twice.
  const html = await render(message.react);
  const text = toPlainText(html);
  const email: OutgoingEmail = { from: settings.mailFrom, to, subject, html, text };

  const transport = options.transport ?? settings.mailTransport;
  return transport === "smtp" ? sendWithSmtp(email, settings.smtpUrl) : sendWithResend(email, settings);
}

function pickMailSettings(source: Env): MailSettings {
  const { mailTransport, resendApiKey, resendBaseUrl, smtpUrl, mailFrom } = source;
  return { mailTransport, resendApiKey, resendBaseUrl, smtpUrl, mailFrom };
}

function invalid(message: string): SendEmailResult {
  return { ok: false, error: { kind: "invalid", message } };
}
