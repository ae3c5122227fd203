/** The certificate page's form (browser and server): a manager revokes with a reason, asked twice. */
import { z } from "zod";

export const CERTIFICATE_INTENTS = { revoke: "revoke" } as const;

export const revokeCertificateSchema = z.object({
  reason: z
    .string({ error: "Give the reason for revoking: anyone checking the code sees that it was revoked, and the reason is kept in the audit trail." })
    .trim()
    .min(1, "Give the reason for revoking: anyone checking the code sees that it was revoked, and the reason is kept in the audit trail.")
    .max(500, "Keep the reason to 500 characters."),
  confirm: z.literal("yes", { error: "Confirm to go ahead: press the confirming button." }),
});
