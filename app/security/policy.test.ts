/**
 * The header and body-size policy (issue 11, item 1), read as a browser would read it.
 * Sources: W3C "Content Security Policy Level 3" (Working Draft, 2024) — nonce-source, §6.4.2
 * frame-ancestors; OWASP Secure Headers Project (2024); RFC 6797 (IETF, 2012) HSTS; RFC 9110
 * (IETF, 2022) §15.5.12 411 and §15.5.14 413; RFC 6177 (IETF, 2011) on /64 end sites.
 */
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import helmet from "helmet";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { addressKey } from "~/auth/rate-limit.server";
import { BODY_LIMITS, bodyLimitFor, DEFAULT_BODY_LIMIT, helmetOptions, judgeBody } from "./policy";

const MB = 1024 * 1024;

/** The headers helmet writes for these options, from a real response. */
async function headersFor(production: boolean, https: boolean): Promise<Headers> {
  const writeHeaders = helmet(helmetOptions("abc123", { production, https }));
  const server: Server = createServer((req, res) => writeHeaders(req, res, () => res.end("ok")));
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  try {
    const { port } = server.address() as AddressInfo;
    return (await fetch(`http://127.0.0.1:${port}/`)).headers;
  } finally {
    server.close();
  }
}

function directives(csp: string): Map<string, string[]> {
  return new Map(csp.split(";").map((d) => d.trim().split(/\s+/)).filter((d) => d[0]).map(([name, ...values]) => [name, values]));
}

describe("the header set", () => {
  it("enforces a CSP whose scripts and style elements need this response's nonce, and forbids framing", async () => {
    const headers = await headersFor(true, true);
    expect(headers.get("Content-Security-Policy-Report-Only")).toBeNull();
    const csp = directives(headers.get("Content-Security-Policy") ?? "");
    expect(csp.get("script-src")).toEqual(["'self'", "'nonce-abc123'"]);
    expect(csp.get("style-src")).toEqual(["'self'", "'nonce-abc123'"]);
    expect(csp.get("script-src-attr")).toEqual(["'none'"]);
    expect(csp.get("frame-ancestors")).toEqual(["'none'"]);
    expect(csp.get("object-src")).toEqual(["'none'"]);
    expect(csp.get("base-uri")).toEqual(["'none'"]);
    expect(csp.get("default-src")).toEqual(["'self'"]);
    // Never a blanket allowance for inline or evaluated script.
    for (const [name, values] of csp) {
      if (name.startsWith("script")) expect(values.filter((v) => v === "'unsafe-inline'" || v === "'unsafe-eval'")).toEqual([]);
    }
    expect(csp.has("upgrade-insecure-requests")).toBe(true);
  });

  it("sends nosniff, a strict Referrer-Policy, X-Frame-Options DENY and no X-Powered-By", async () => {
    const headers = await headersFor(false, false);
    expect(headers.get("X-Content-Type-Options")).toBe("nosniff");
    expect(headers.get("Referrer-Policy")).toBe("same-origin");
    expect(headers.get("X-Frame-Options")).toBe("DENY");
    expect(headers.get("X-Powered-By")).toBeNull();
    expect(headers.get("Cross-Origin-Opener-Policy")).toBe("same-origin");
  });

  it("sends HSTS in production only, and upgrades requests only when the public address is https", async () => {
    expect((await headersFor(true, false)).get("Strict-Transport-Security")).toBe("max-age=31536000; includeSubDomains");
    const dev = await headersFor(false, false);
    expect(dev.get("Strict-Transport-Security")).toBeNull();
    expect(directives(dev.get("Content-Security-Policy") ?? "").has("upgrade-insecure-requests")).toBe(false);
  });
});

describe("body limits", () => {
  it("gives uploads their own limit and everything else 1 MB; a data request shares its page's", () => {
    expect(bodyLimitFor("/credentials")).toBe(26 * MB);
    expect(bodyLimitFor("/credentials.data")).toBe(26 * MB);
    expect(bodyLimitFor("/checkoffs/abc123")).toBe(11 * MB);
    expect(bodyLimitFor("/checkoffs/abc123/print")).toBe(DEFAULT_BODY_LIMIT);
    expect(bodyLimitFor("/admin/roster")).toBe(5 * MB);
    expect(bodyLimitFor("/bank/import")).toBe(3 * MB);
    expect(bodyLimitFor("/exams/attempt-1")).toBe(MB);
    expect(bodyLimitFor("/api/v1/credentials")).toBe(MB);
    for (const limit of BODY_LIMITS) expect(limit.bytes).toBeGreaterThan(DEFAULT_BODY_LIMIT);
  });

  it("refuses a 50 MB post 413 with its size and the limit, from the declared length alone", () => {
    expect(judgeBody("POST", "/credentials", { contentLength: String(50 * MB), transferEncoding: null })).toEqual({
      ok: false,
      status: 413,
      message: "The request is 50.0 MB; this address takes at most 26 MB.",
    });
    expect(judgeBody("POST", "/login", { contentLength: String(MB + 1), transferEncoding: null })).toMatchObject({ ok: false, status: 413 });
    expect(judgeBody("POST", "/login", { contentLength: String(MB), transferEncoding: null })).toEqual({ ok: true });
  });

  it("asks a chunked body without a length for one (411), refuses a length that is not a size, and lets reads through", () => {
    expect(judgeBody("POST", "/login", { contentLength: null, transferEncoding: "chunked" })).toMatchObject({ ok: false, status: 411 });
    expect(judgeBody("POST", "/login", { contentLength: "12abc", transferEncoding: null })).toMatchObject({ ok: false, status: 413 });
    expect(judgeBody("POST", "/login", { contentLength: "-1", transferEncoding: null })).toMatchObject({ ok: false, status: 413 });
    expect(judgeBody("POST", "/logout", { contentLength: null, transferEncoding: null })).toEqual({ ok: true });
    expect(judgeBody("GET", "/credentials", { contentLength: String(50 * MB), transferEncoding: null })).toEqual({ ok: true });
  });
});

describe("rate-limit keys for addresses", () => {
  it("reads an IPv4-mapped address as IPv4 and keys IPv6 by its /64", () => {
    expect(addressKey("::ffff:198.51.100.7")).toBe("198.51.100.7");
    expect(addressKey("198.51.100.7")).toBe("198.51.100.7");
    expect(addressKey("2001:db8:5:7::1")).toBe("2001:db8:5:7::/64");
    expect(addressKey("2001:0db8:0005:0007:abcd:0:0:9")).toBe("2001:db8:5:7::/64");
    expect(addressKey("2001:db8::1")).toBe("2001:db8:0:0::/64");
    expect(addressKey("::1")).toBe("0:0:0:0::/64");
    expect(addressKey("2001:db8:5:8::1")).not.toBe(addressKey("2001:db8:5:7::1"));
  });
});
