import { describe, expect, it } from "vitest";
import { isSameOriginRequest } from "./gate.server";

const post = (headers: Record<string, string>) => new Request("http://localhost:3000/admin", { method: "POST", headers });

describe("cross-site request refusal (OWASP ASVS 4.0.3 V4.2.2)", () => {
  it("accepts a post whose Origin is Tidemark's own", () => {
    expect(isSameOriginRequest(post({ Origin: "http://localhost:3000" }))).toBe(true);
  });
  it("accepts the configured public address behind a proxy", () => {
    expect(isSameOriginRequest(post({ Origin: "https://tidemark.example.org" }), "https://tidemark.example.org")).toBe(true);
  });
  it("refuses another site's Origin even when Sec-Fetch-Site claims same-origin", () => {
    expect(isSameOriginRequest(post({ Origin: "http://evil.test", "Sec-Fetch-Site": "same-origin" }))).toBe(false);
  });
  it("accepts Sec-Fetch-Site same-origin when no Origin is sent", () => {
    expect(isSameOriginRequest(post({ "Sec-Fetch-Site": "same-origin" }))).toBe(true);
  });
  it("refuses a request that shows neither header", () => {
    expect(isSameOriginRequest(post({}))).toBe(false);
  });
  it("refuses a same-site but cross-origin request", () => {
    expect(isSameOriginRequest(post({ "Sec-Fetch-Site": "same-site" }))).toBe(false);
  });
});
