// What the sign-in message tells the person, in both its HTML and its text version.
import { render } from "@react-email/render";
import { describe, expect, it } from "vitest";
import SignInCodeEmail, { signInCodeSubject } from "../../emails/sign-in-code";

const props = { code: "730154", magicLink: "https://tidemark.example/login/verify?token=abc", expiresMinutes: 10 };

describe("sign-in code e-mail", () => {
  it("says the code, the link, its browser limit, the expiry and that it can be ignored — in HTML and text", async () => {
    const element = <SignInCodeEmail {...props} personName="Ana Reyes" />;
    const html = await render(element);
    const text = await render(element, { plainText: true });

    expect(html).toMatch(/^<!DOCTYPE html/);
    expect(html).toContain('lang="en"');
    expect(html).toContain('href="https://tidemark.example/login/verify?token=abc"');
    for (const version of [html, text]) {
      expect(version).toContain("Hello Ana Reyes,");
      expect(version).toContain("730154");
      expect(version).toContain("only works in the browser where you asked for the code");
      expect(version).toContain("expire in 10 minutes");
      expect(version).toContain("you can ignore this message");
      expect(version).toContain("Tidemark");
    }
    expect(text).toContain("https://tidemark.example/login/verify?token=abc");
    expect(text).not.toMatch(/<[a-z][^>]*>/i);
  });

  it("greets without a name, says '1 minute' in the singular and escapes hostile names", async () => {
    expect(await render(<SignInCodeEmail {...props} expiresMinutes={1} />, { plainText: true })).toMatch(/Hello,[\s\S]*expire in 1 minute\./);
    const html = await render(<SignInCodeEmail {...props} personName={'<img src=x onerror="alert(1)">'} />);
    expect(html).not.toContain("<img src=x");
    expect(html).toContain("&lt;img src=x");
  });

  it("keeps the code out of the subject, which shows on locked screens", () => {
    expect(signInCodeSubject(props)).toBe("Your Tidemark sign-in code");
    expect(signInCodeSubject(props)).not.toContain(props.code);
  });
});
