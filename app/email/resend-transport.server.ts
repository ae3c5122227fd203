import { Resend } from "resend";
import type { MailSettings, OutgoingEmail, SendEmailError, SendEmailResult } from "./send-email.server";

/**
 * Sends through the Resend SDK. `baseUrl` is a constructor option in resend 6.38.0
 * (node_modules/resend/dist/index.d.mts, `ResendOptions`), so the fake is chosen per
 * client rather than through the process-wide RESEND_BASE_URL variable.
 * The SDK never throws for a failed request: it returns `{ data: null, error }`.
 */
export async function sendWithResend(
  email: OutgoingEmail,
  settings: Pick<MailSettings, "resendApiKey" | "resendBaseUrl">,
): Promise<SendEmailResult> {
  if (!settings.resendApiKey) {
    // The SDK's constructor throws on a missing key; turn it into the same typed failure.
    return { ok: false, error: { kind: "rejected", message: "RESEND_API_KEY is not set." } };
  }
  const resend = new Resend(settings.resendApiKey, { baseUrl: settings.resendBaseUrl });
  try {
    const { data, error } = await resend.emails.send(email);
    if (error) return { ok: false, error: classify(error.statusCode, error.message) };
    return { ok: true, id: data.id };
  } catch (cause) {
    // Belt and braces: a future SDK version, or an aborted request, may still throw.
    return { ok: false, error: { kind: "unreachable", message: cause instanceof Error ? cause.message : String(cause) } };
  }
}

/** The SDK reports a network failure as statusCode null. */
function classify(statusCode: number | null, message: string): SendEmailError {
  if (statusCode === null || statusCode >= 500) return { kind: "unreachable", message };
  if (statusCode === 400 || statusCode === 422) return { kind: "invalid", message };
  return { kind: "rejected", message };
}
