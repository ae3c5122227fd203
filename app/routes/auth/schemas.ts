import { z } from "zod";

export const EmailSchema = z.object({
  email: z
    .string({ error: "Enter your work e-mail address." })
    .trim()
    .min(1, "Enter your work e-mail address.")
    .max(254, "That address is too long.")
    .email("Enter a full e-mail address, like name@hospital.org."),
});

export const CodeSchema = z.object({
  code: z
    .string({ error: "Enter the 6-digit code from the e-mail." })
    .trim()
    .transform((s) => s.replace(/\s+/g, ""))
    .pipe(z.string().regex(/^\d{6}$/, "The code is 6 digits, like 482913.")),
});
