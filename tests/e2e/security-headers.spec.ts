/**
 * The header set and the body limit on every kind of response the production build gives
 * (issue 11, item 1): a page, a client data request, a resource route, the JSON API, static
 * assets, a 404, a 500 and a refused oversize post. In chromium, a page runs under the enforcing
 * policy with no violation (any would reach the console guard).
 * Sources: W3C "Content Security Policy Level 3" (Working Draft, 2024) — nonce-source,
 * frame-ancestors; OWASP Secure Headers Project (2024); RFC 6797 (IETF, 2012) HSTS; RFC 9110
 * (IETF, 2022) §15.5.14 413 Content Too Large.
 */
import http from "node:http";
import { request as playwrightRequest, type APIResponse } from "@playwright/test";
import { APP_PORT } from "../fixtures/e2e-env";
import { statusNote } from "../fixtures/sign-in-flow";
import { expect, test } from "../fixtures/test";

const MB = 1024 * 1024;

/** The headers every response carries; returns the response's CSP nonce. */
function expectSecurityHeaders(what: string, headers: Record<string, string>): string {
  const csp = headers["content-security-policy"] ?? "";
  expect(csp, `${what}: Content-Security-Policy`).toMatch(/frame-ancestors 'none'/);
  expect(headers["content-security-policy-report-only"], `${what}: enforcing, not report-only`).toBeUndefined();
  const nonce = /script-src 'self' 'nonce-([A-Za-z0-9+/=]+)'/.exec(csp)?.[1];
  expect(nonce, `${what}: a script nonce in ${csp}`).toBeTruthy();
  expect(headers["x-content-type-options"], `${what}: nosniff`).toBe("nosniff");
  expect(headers["referrer-policy"], `${what}: Referrer-Policy`).toBe("same-origin");
  expect(headers["x-frame-options"], `${what}: X-Frame-Options`).toBe("DENY");
  // The suite's servers run NODE_ENV=production.
  expect(headers["strict-transport-security"], `${what}: HSTS`).toBe("max-age=31536000; includeSubDomains");
  expect(headers["permissions-policy"], `${what}: Permissions-Policy`).toContain("camera=()");
  expect(headers["x-powered-by"], `${what}: no X-Powered-By`).toBeUndefined();
  return nonce ?? "";
}

/** Every script element of a page's markup carries the response's nonce (none is left without). */
function expectScriptsCarry(html: string, nonce: string) {
  const scripts = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
  expect(scripts.length).toBeGreaterThan(0);
  for (const tag of scripts) expect(tag, "a script element without this response's nonce").toContain(`nonce="${nonce}"`);
}

test.describe("every response type carries the header set", () => {
  let api: Awaited<ReturnType<typeof playwrightRequest.newContext>>;
  test.beforeAll(async () => {
    api = await playwrightRequest.newContext({ baseURL: `http://localhost:${APP_PORT}` });
  });
  test.afterAll(async () => api.dispose());

  const get = (path: string) => api.get(path, { maxRedirects: 0 });
  const headersOf = (response: APIResponse) => response.headers();

  test("a page: its scripts carry a fresh nonce per response", async () => {
    const first = await get("/login");
    expect(first.status()).toBe(200);
    const nonce = expectSecurityHeaders("document", headersOf(first));
    expectScriptsCarry(await first.text(), nonce);
    const second = await get("/login");
    const again = expectSecurityHeaders("document again", headersOf(second));
    expect(again, "a new nonce for every response").not.toBe(nonce);
    expectScriptsCarry(await second.text(), again);
  });

  test("a client data request, a resource route, the API, an asset, a 404 and a 500", async () => {
    const page = await get("/login");
    const asset = /\/assets\/[^"]+\.js/.exec(await page.text())?.[0];
    expect(asset, "a built script in the page").toBeTruthy();
    const cases: { what: string; path: string; status: number; type?: RegExp }[] = [
      { what: "data request", path: "/login.data", status: 200 },
      { what: "resource route", path: "/healthz", status: 200, type: /json/ },
      { what: "JSON API", path: "/api/v1/people", status: 401, type: /json/ },
      { what: "built asset", path: asset ?? "/assets/missing.js", status: 200, type: /javascript/ },
      { what: "public file", path: "/favicon.svg", status: 200, type: /svg/ },
      { what: "404 page", path: "/no-such-page-here", status: 404, type: /html/ },
      { what: "404 data request", path: "/no-such-page-here.data", status: 404 },
      { what: "500 page", path: "/dev/fault?raise=1", status: 500, type: /html/ },
    ];
    for (const c of cases) {
      const response = await get(c.path);
      expect(response.status(), `${c.what} ${c.path}`).toBe(c.status);
      if (c.type) expect(headersOf(response)["content-type"], `${c.what} content type`).toMatch(c.type);
      const nonce = expectSecurityHeaders(`${c.what} ${c.path}`, headersOf(response));
      if (c.what.endsWith("page")) expectScriptsCarry(await response.text(), nonce);
    }
  });
});

test("the error page and the sign-in page run their scripts under the policy without a violation", async ({ page, consoleGuard }) => {
  // A violation is also reported on the console ("Refused to execute…"), which the guard fails on.
  consoleGuard.allow(statusNote(500));
  const violations: string[] = [];
  await page.exposeFunction("reportViolation", (v: string) => violations.push(v));
  await page.addInitScript(() => {
    document.addEventListener("securitypolicyviolation", (e) => (window as unknown as { reportViolation(v: string): void }).reportViolation(`${e.violatedDirective} ${e.blockedURI}`));
  });
  const hydrated = () => page.evaluate(() => typeof (window as unknown as { __reactRouterRouteModules?: object }).__reactRouterRouteModules === "object");
  const fault = await page.goto("/dev/fault?raise=1");
  expect(fault?.status()).toBe(500);
  await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
  await expect.poll(hydrated, { message: "the error page's nonce'd scripts ran" }).toBe(true);
  await page.goto("/login");
  await expect.poll(hydrated, { message: "the sign-in page's nonce'd scripts ran" }).toBe(true);
  expect(violations).toEqual([]);
});

/** Posts a declared 50 MB body, sending only its first megabyte; resolves at the response. */
function postFiftyMegabytes(path: string): Promise<{ status: number; ms: number; headers: http.IncomingHttpHeaders; body: string }> {
  return new Promise((resolve, reject) => {
    const started = performance.now();
    const req = http.request({ host: "127.0.0.1", port: APP_PORT, path, method: "POST", headers: { "Content-Type": "multipart/form-data; boundary=x", "Content-Length": String(50 * MB), Origin: `http://localhost:${APP_PORT}` } }, (res) => {
      const ms = performance.now() - started;
      let body = "";
      res.setEncoding("utf8");
      res.on("data", (chunk) => (body += chunk));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, ms, headers: res.headers, body }));
    });
    // The server answers and closes before reading; writes after that may fail, which is the point.
    req.on("error", (error) => (/EPIPE|ECONNRESET/.test(String(error)) ? undefined : reject(error)));
    req.write(Buffer.alloc(MB, 0x61));
  });
}

test("a 50 MB post is refused 413 in under a second, before it is read, with the header set", async () => {
  for (const path of ["/credentials", "/checkoffs/any", "/login", "/api/v1/credentials"]) {
    const answer = await postFiftyMegabytes(path);
    expect(answer.status, path).toBe(413);
    expect(answer.ms, `${path}: answered in ${answer.ms.toFixed(0)} ms`).toBeLessThan(1000);
    expect(answer.headers.connection, `${path}: the connection is closed`).toBe("close");
    expectSecurityHeaders(`413 ${path}`, answer.headers as Record<string, string>);
    if (path.startsWith("/api/")) expect(JSON.parse(answer.body).error.code).toBe("payload_too_large");
    else expect(answer.body).toMatch(/^The request is 50\.0 MB; this address takes at most \d+ MB\.$/);
  }
});
