/**
 * The faults run's verdict (tests/faults/ledger.ts): what must be found in the database after
 * the kills, decided per question from the last acknowledged save. These cases are the ones the
 * run cannot stage on purpose — a missing write, a later save cut by the kill, a backup's cutoff —
 * so the check itself is shown to fail when it should. Rules: common practice, no source
 * (a write the server acknowledged must survive; one it never answered may or may not).
 */
import { describe, expect, it } from "vitest";
import { fingerprint, Ledger, verify, type StoredState } from "../faults/ledger";

const A = "attempt-a";
const B = "attempt-b";

function stored(answers: Record<string, unknown>, signed: string[] = []): StoredState {
  return { answers: new Map(Object.entries(answers).map(([k, v]) => [k, fingerprint(v)])), signedCheckoffs: new Set(signed) };
}

describe("fingerprint", () => {
  it("is the same for an answer as sent and as stored", () => {
    expect(fingerprint({ kind: "multiple", choices: [3, 1] })).toBe(fingerprint({ kind: "multiple", choices: [1, 3] }));
    // A numeric answer is stored with its parsed value beside the text typed.
    expect(fingerprint({ kind: "numeric", text: " 12 " })).toBe(fingerprint({ kind: "numeric", value: 12, text: "12" }));
    expect(fingerprint({ kind: "single", choice: 2 })).not.toBe(fingerprint({ kind: "single", choice: 3 }));
    expect(fingerprint(null)).toBe("empty");
  });
});

describe("verify", () => {
  it("counts every acknowledged write found, comparing a question with its last acknowledged save", () => {
    const ledger = new Ledger();
    ledger.settle(ledger.save(A, 0, { kind: "single", choice: 1 }), "ack", 200);
    ledger.settle(ledger.save(A, 0, { kind: "single", choice: 2 }), "ack", 200);
    ledger.settle(ledger.save(B, 4, { kind: "numeric", text: "11" }), "ack", 200);
    ledger.settle(ledger.sign("checkoff-1"), "ack", 302);
    const verdict = verify(ledger, stored({ [`${A}:0`]: { kind: "single", choice: 2 }, [`${B}:4`]: { kind: "numeric", value: 11, text: "11" } }, ["checkoff-1"]));
    expect(verdict).toMatchObject({ acknowledged: 4, found: 4, missing: [], saves: { acknowledged: 3, questions: 2, superseded: 1, found: 3 }, signs: { acknowledged: 1, found: 1 } });
  });

  it("reports an acknowledged save that is missing, or holds an older value", () => {
    const ledger = new Ledger();
    ledger.settle(ledger.save(A, 0, { kind: "single", choice: 1 }), "ack", 200);
    ledger.settle(ledger.save(A, 0, { kind: "single", choice: 2 }), "ack", 200);
    ledger.settle(ledger.save(A, 1, { kind: "single", choice: 1 }), "ack", 200);
    // Position 0 went back to the first value (the second save lost); position 1 has no row.
    const verdict = verify(ledger, stored({ [`${A}:0`]: { kind: "single", choice: 1 } }));
    expect(verdict.acknowledged).toBe(3);
    expect(verdict.found).toBe(0);
    expect(verdict.missing).toEqual([`answer ${A}:0: acknowledged single:2 (save #1), database holds single:1`, `answer ${A}:1: acknowledged single:1 (save #2), database holds no row`]);
  });

  it("accepts the value of a later save whose reply the kill cut, but not of a refused one", () => {
    const ledger = new Ledger();
    ledger.settle(ledger.save(A, 0, { kind: "single", choice: 1 }), "ack", 200);
    ledger.settle(ledger.save(A, 0, { kind: "single", choice: 2 }), "unknown");
    ledger.settle(ledger.save(A, 3, { kind: "single", choice: 1 }), "ack", 200);
    ledger.settle(ledger.save(A, 3, { kind: "single", choice: 2 }), "refused", 409);
    const verdict = verify(ledger, stored({ [`${A}:0`]: { kind: "single", choice: 2 }, [`${A}:3`]: { kind: "single", choice: 2 } }));
    expect(verdict.saves).toMatchObject({ acknowledged: 2, found: 1, heldByUnconfirmedLaterSave: 1 });
    expect(verdict.missing).toEqual([`answer ${A}:3: acknowledged single:1 (save #2), database holds single:2`]);
  });

  it("reports an acknowledged sign-off without its signature", () => {
    const ledger = new Ledger();
    ledger.settle(ledger.sign("checkoff-1"), "ack", 302);
    ledger.settle(ledger.sign("checkoff-2"), "unknown");
    const verdict = verify(ledger, stored({}, []));
    expect(verdict).toMatchObject({ acknowledged: 1, found: 0 });
    expect(verdict.missing[0]).toContain("checkoff-1");
  });

  it("for a backup, requires only writes acknowledged before it began, and accepts later ones", () => {
    const ledger = new Ledger();
    const first = ledger.save(A, 0, { kind: "single", choice: 1 });
    ledger.settle(first, "ack", 200);
    first.ackAt = 100;
    const later = ledger.save(A, 0, { kind: "single", choice: 2 });
    ledger.settle(later, "ack", 200);
    later.ackAt = 300;
    const afterwards = ledger.save(A, 1, { kind: "single", choice: 1 });
    ledger.settle(afterwards, "ack", 200);
    afterwards.ackAt = 400;
    // Backup at 200: position 0 may hold the first value or the later one; position 1 is not required.
    expect(verify(ledger, stored({ [`${A}:0`]: { kind: "single", choice: 1 } }), 200)).toMatchObject({ acknowledged: 1, found: 1 });
    expect(verify(ledger, stored({ [`${A}:0`]: { kind: "single", choice: 2 } }), 200)).toMatchObject({ acknowledged: 1, found: 1 });
    expect(verify(ledger, stored({}), 200)).toMatchObject({ acknowledged: 1, found: 0 });
  });
});
