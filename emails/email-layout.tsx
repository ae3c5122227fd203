import { Body, Container, Head, Hr, Html, Preview, Section, Text } from "@react-email/components";
import type { CSSProperties, ReactNode } from "react";

/**
 * The frame every Tidemark e-mail shares: warm paper, dark sea-green ink, one column.
 * Inline styles only — e-mail clients drop style sheets and most web fonts, hence the
 * fallback font stack after Source Sans 3.
 */
export const emailColours = { paper: "#FAF6EF", ink: "#17302E", sea: "#0F5C57", card: "#FFFFFF", rule: "#E4DCCD" };

const font = "'Source Sans 3', 'Segoe UI', Helvetica, Arial, sans-serif";

const styles = {
  body: { backgroundColor: emailColours.paper, color: emailColours.ink, fontFamily: font, margin: 0, padding: "24px 0" },
  container: {
    backgroundColor: emailColours.card,
    border: `1px solid ${emailColours.rule}`,
    borderRadius: "8px",
    maxWidth: "520px",
    padding: "28px 32px",
  },
  mark: { color: emailColours.sea, fontSize: "18px", fontWeight: 700, letterSpacing: "0.02em", margin: "0 0 20px" },
  footer: { color: emailColours.ink, fontSize: "13px", lineHeight: "20px", margin: 0, opacity: 0.8 },
} satisfies Record<string, CSSProperties>;

export function EmailLayout({ preview, children }: { preview: string; children: ReactNode }) {
  return (
    <Html lang="en" dir="ltr">
      <Head />
      <Preview>{preview}</Preview>
      <Body style={styles.body}>
        <Container style={styles.container}>
          <Text style={styles.mark}>Tidemark</Text>
          <Section>{children}</Section>
          <Hr style={{ borderColor: emailColours.rule, margin: "24px 0 16px" }} />
          <Text style={styles.footer}>
            Tidemark keeps competency, check-off and credential records for your respiratory care department.
          </Text>
        </Container>
      </Body>
    </Html>
  );
}
