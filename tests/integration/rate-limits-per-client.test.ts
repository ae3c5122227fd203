/**
 * Limits per client (issue 11, item 1): wrong signing PINs from one device, whoever the signer,
 * and calls with unknown tokens from one API client. The client is the address our server puts in
 * x-tidemark-client (scripts/serve.mjs; behind proxies, the one the outermost trusted proxy saw).
 * Sources: OWASP ASVS 4.0.3 (2021) V2.2.1 anti-automation; RFC 6585 §4 (IETF, 2012) 429 with
 * Retry-After; US 21 CFR Part 11 §11.300(d) (attempts at unauthorised use limited).
 */
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { BAD_TOKENS_PER_CLIENT, WRONG_PINS_PER_CLIENT } from "~/auth/rate-limit.server";
import { authenticate, createToken } from "~/api/token.server";
import type { Database } from "~/db/client.server";
import { checkoffs, signatures } from "~/db/schema";
import * as checkoffPage from "~/routes/checkoffs/checkoff";
import { useSeededDatabase } from "../setup/db";
import { args, postForm, TEST_ORIGIN, viewerFor } from "../setup/request";
import { type ArgsOf, fieldErrors, outcome } from "./admin-harness";
import { givePin, observedCompetent, PINS, requested } from "./checkoffs-harness";

let db: Database;
let therapist: Viewer;
let preceptor: Viewer;

beforeAll(async () => {
  db = await useSeededDatabase();
  therapist = await viewerFor("therapist@kestrelvalley.test");
  preceptor = await viewerFor("preceptor@kestrelvalley.test");
  await givePin(preceptor, PINS.preceptor);
});

function fromClient(request: Request, address: string): Request {
  request.headers.set("x-tidemark-client", address);
  return request;
}

describe("wrong signing PINs from one device", () => {
  it(`after ${WRONG_PINS_PER_CLIENT.limit} unknown signers the device is paused — even for a right PIN — while another device signs`, async () => {
    const { id, steps } = await requested(therapist);
    await observedCompetent(preceptor, id, steps);
    const send = (fields: Record<string, string>, address: string) =>
      checkoffPage.action(args<ArgsOf<typeof checkoffPage.action>>(fromClient(postForm(`/checkoffs/${id}`, { intent: "sign", ...fields }), address), preceptor, { checkoffId: id }));
    const sign = (fields: Record<string, string>, address: string) => outcome(send(fields, address));
    // A different made-up signer each time: no one person's lock (5 wrong) is ever reached.
    for (let i = 0; i < WRONG_PINS_PER_CLIENT.limit; i++) {
      const wrong = await sign({ email: `nobody${i}@kestrelvalley.test`, pin: "000000" }, "198.51.100.7");
      expect(wrong.status).toBeGreaterThanOrEqual(400);
      expect(wrong.status).toBeLessThan(500);
      expect(JSON.stringify(wrong.body)).toContain("We could not confirm that signer");
    }
    const raw = (await send({ pin: PINS.preceptor }, "198.51.100.7")) as unknown as { init: { status: number; headers: Record<string, string> } };
    expect(Number(raw.init.headers["Retry-After"])).toBeGreaterThan(0);
    const paused = await sign({ pin: PINS.preceptor }, "198.51.100.7");
    expect(paused.status).toBe(429);
    expect(fieldErrors(paused.body, "")[0]).toMatch(/^Too many wrong PINs from this device\. Signing here is paused for \d+ minutes?\.$/);
    // The PIN is never written back into the page.
    expect(JSON.stringify(paused.body)).not.toContain(PINS.preceptor);
    expect((await db.db.select().from(checkoffs).where(eq(checkoffs.id, id)))[0].status).toBe("in-progress");

    // The same /64 counts as the same device; another address is not held up.
    const sameNetwork = await sign({ pin: PINS.preceptor }, "::ffff:198.51.100.7");
    expect(sameNetwork.status).toBe(429);
    const elsewhere = await sign({ pin: PINS.preceptor }, "203.0.113.20");
    expect(elsewhere.status).toBe(302);
    expect(await db.db.select().from(signatures).where(eq(signatures.recordId, id))).toHaveLength(1);
  });
});

describe("unknown API tokens from one client", () => {
  it(`after ${BAD_TOKENS_PER_CLIENT.limit} unknown tokens the client gets 429 even with a good token; others are served`, async () => {
    const admin = await viewerFor("admin@kestrelvalley.test");
    const { token } = await createToken(admin.org.id, admin.person.id, { name: "per-client limit test", scopes: ["read"], expiresOn: null });
    const call = async (bearer: string, address: string) => {
      const request = new Request(new URL("/api/v1/people", TEST_ORIGIN), { headers: { Authorization: `Bearer ${bearer}`, "x-tidemark-client": address } });
      try {
        await authenticate(request, "read");
        return 200;
      } catch (error) {
        if (error instanceof Response) return error;
        throw error;
      }
    };
    for (let i = 0; i < BAD_TOKENS_PER_CLIENT.limit; i++) {
      const refused = await call(`tm_not_a_token_${i}`, "2001:db8:5:7::1");
      expect(refused).toBeInstanceOf(Response);
      expect((refused as Response).status).toBe(401);
    }
    // Another address in the same /64 is the same client.
    const limited = await call(token, "2001:db8:5:7:abcd::9");
    expect(limited).toBeInstanceOf(Response);
    const response = limited as Response;
    expect(response.status).toBe(429);
    expect(Number(response.headers.get("Retry-After"))).toBeGreaterThan(0);
    expect((await response.json()).error).toMatchObject({ code: "rate_limited", message: expect.stringContaining("unknown, revoked or expired tokens") });
    expect(await call(token, "2001:db8:5:8::1")).toBe(200);
  });
});
