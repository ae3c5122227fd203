import { Button, Heading, Text } from "@react-email/components";
import type { CSSProperties } from "react";
import { EmailLayout, emailColours } from "./email-layout";

export type SignInCodeEmailProps = {
  personName?: string;
  code: string;
  /** Absolute address of the magic link. */
  magicLink: string;
  expiresMinutes: number;
};

/**
 * The code stays out of the subject and preview line: both show on locked phone screens
 * and in shared inbox lists, the body does not.
 */
export function signInCodeSubject(_props?: SignInCodeEmailProps): string {
  return "Your Tidemark sign-in code";
}

const styles = {
  heading: { color: emailColours.ink, fontSize: "22px", fontWeight: 700, margin: "0 0 16px" },
  text: { color: emailColours.ink, fontSize: "16px", lineHeight: "24px", margin: "0 0 14px" },
  code: {
    backgroundColor: emailColours.paper,
    border: `1px solid ${emailColours.rule}`,
    borderRadius: "6px",
    color: emailColours.sea,
    fontFamily: "'SFMono-Regular', Consolas, 'Liberation Mono', monospace",
    fontSize: "30px",
    fontWeight: 700,
    lineHeight: "40px",
    letterSpacing: "0.2em",
    margin: "0 0 20px",
    padding: "12px 0",
    textAlign: "center",
  },
  button: {
    backgroundColor: emailColours.sea,
    borderRadius: "6px",
    color: "#FFFFFF",
    fontSize: "16px",
    fontWeight: 600,
    padding: "12px 20px",
    textDecoration: "none",
  },
} satisfies Record<string, CSSProperties>;

function minutes(n: number): string {
  return n === 1 ? "1 minute" : `${n} minutes`;
}

export default function SignInCodeEmail({ personName, code, magicLink, expiresMinutes }: SignInCodeEmailProps) {
  const lifetime = minutes(expiresMinutes);
  return (
    <EmailLayout preview={`Your sign-in code works for ${lifetime}.`}>
      <Heading as="h1" style={styles.heading}>
        Sign in to Tidemark
      </Heading>
      <Text style={styles.text}>{personName ? `Hello ${personName},` : "Hello,"}</Text>
      <Text style={styles.text}>Type this code on the sign-in page:</Text>
      <Text style={styles.code}>{code}</Text>
      <Text style={styles.text}>Or sign in with one click:</Text>
      <Button href={magicLink} style={styles.button}>
        Sign in to Tidemark
      </Button>
      <Text style={{ ...styles.text, marginTop: "20px" }}>
        The link only works in the browser where you asked for the code. On another device, type the code instead.
      </Text>
      {/* One string, so the text version has no rendering seams inside the sentence. */}
      <Text style={styles.text}>{`The code and the link work once and expire in ${lifetime}.`}</Text>
      <Text style={styles.text}>
        If you did not ask to sign in, you can ignore this message. Nobody can sign in without the code.
      </Text>
    </EmailLayout>
  );
}
