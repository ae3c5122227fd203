import { describe, expect, it } from "vitest";
import { canAcknowledgeCheckoff, canAddAddendum, canAttachEvidence, canObserveCheckoff, canSignCheckoff, canViewCheckoff, type Actor, type CheckoffFacts } from "./checkoff-policy";

const org = "kv";
const therapist: Actor = { id: "t", orgId: org, roles: ["therapist"] };
const otherTherapist: Actor = { id: "t2", orgId: org, roles: ["therapist"] };
const preceptor: Actor = { id: "p", orgId: org, roles: ["therapist", "preceptor"] };
const foreignPreceptor: Actor = { id: "x", orgId: "ab", roles: ["therapist", "preceptor"] };
const manager: Actor = { id: "m", orgId: org, roles: ["manager"] };
const educator: Actor = { id: "e", orgId: org, roles: ["therapist", "educator"] };
const c = (status: CheckoffFacts["status"], personId = "t", preceptorId: string | null = "p"): CheckoffFacts => ({ orgId: org, personId, preceptorId, status });

describe("check-off policy", () => {
  it("shows a check-off to its therapist, preceptors, educators and managers of the organisation only", () => {
    expect([therapist, preceptor, manager, educator].map((a) => canViewCheckoff(a, c("signed")))).toEqual([true, true, true, true]);
    expect(canViewCheckoff(otherTherapist, c("signed"))).toBe(false);
    expect(canViewCheckoff(foreignPreceptor, c("signed"))).toBe(false);
  });

  it("nobody signs their own check-off, not even a preceptor", () => {
    expect(canSignCheckoff(therapist, c("in-progress"))).toBe(false);
    expect(canSignCheckoff({ ...preceptor }, c("in-progress", "p"))).toBe(false);
    expect(canSignCheckoff(preceptor, c("in-progress"))).toBe(true);
    expect(canSignCheckoff(foreignPreceptor, c("in-progress"))).toBe(false);
  });

  it("a signed check-off cannot be observed again; only its therapist acknowledges it", () => {
    expect(canObserveCheckoff(preceptor, c("signed"))).toBe(false);
    expect(canAcknowledgeCheckoff(therapist, c("signed"))).toBe(true);
    expect(canAcknowledgeCheckoff(preceptor, c("signed"))).toBe(false);
    expect(canAcknowledgeCheckoff(therapist, c("acknowledged"))).toBe(false);
  });

  it("addenda come from the signing preceptor or an educator, never the therapist or a manager", () => {
    expect(canAddAddendum(preceptor, c("acknowledged"))).toBe(true);
    expect(canAddAddendum(educator, c("signed"))).toBe(true);
    expect(canAddAddendum(therapist, c("signed"))).toBe(false);
    expect(canAddAddendum(manager, c("signed"))).toBe(false);
    expect(canAddAddendum(preceptor, c("in-progress"))).toBe(false);
  });

  it("managers read evidence but do not attach it", () => {
    expect(canAttachEvidence(manager, c("signed"))).toBe(false);
    expect(canAttachEvidence(therapist, c("requested"))).toBe(true);
  });
});
