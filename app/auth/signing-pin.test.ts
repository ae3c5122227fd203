import { describe, expect, it } from "vitest";
import { hashPin, lockedUntil, MAX_PIN_FAILURES, pinProblem, PIN_LOCK_MINUTES, verifyPin } from "./signing-pin.server";

describe("the signing PIN (21 CFR Part 11 §11.200(a)(1): the second identification component)", () => {
  it("is stored as a salted scrypt hash: never the PIN, never the same twice, and verifies", async () => {
    const a = await hashPin("482913");
    const b = await hashPin("482913");
    expect(a).not.toContain("482913");
    expect(a).toMatch(/^scrypt\$16384\$8\$1\$/);
    expect(a).not.toBe(b);
    expect(await verifyPin("482913", a)).toBe(true);
    expect(await verifyPin("482914", a)).toBe(false);
    expect(await verifyPin("482913", "plain")).toBe(false);
  });

  it.each([
    ["12345", /at least 6/],
    ["12a456", /digits only/],
    ["111111", /repeat/],
    ["123456", /run/],
    ["987654", /run/],
    ["1234567890123", /at most 12/],
  ])("refuses %s", (pin, message) => {
    expect(pinProblem(pin)).toMatch(message);
  });

  it("accepts an ordinary six-digit PIN", () => {
    expect(pinProblem("482913")).toBeNull();
  });

  it(`locks for ${PIN_LOCK_MINUTES} minutes after ${MAX_PIN_FAILURES} wrong PINs, then lets the signer try again`, () => {
    const last = new Date("2026-12-02T10:00:00Z");
    expect(lockedUntil(MAX_PIN_FAILURES - 1, last, last)).toBeNull();
    expect(lockedUntil(MAX_PIN_FAILURES, last, new Date("2026-12-02T10:14:59Z"))).toEqual(new Date("2026-12-02T10:15:00Z"));
    expect(lockedUntil(MAX_PIN_FAILURES, last, new Date("2026-12-02T10:15:00Z"))).toBeNull();
  });
});
