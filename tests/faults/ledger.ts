/**
 * The faults run's ledger: every write it sent, what the server answered, and what must
 * therefore be in the database afterwards.
 *
 * An answer save may be overwritten by a later save of the same question, so what must be found
 * is decided per (attempt, question): the value of the LAST acknowledged save. One exception is
 * allowed, and counted apart: a later save of the same question that was sent but whose reply
 * never came (the server was killed with it in flight) may have committed before the kill, so
 * its value is accepted too. Each examinee sends one save at a time, so the saves of one
 * question are ordered by sending, and every later save differs from the one before it (see
 * run.ts's answerFor), so a value found names the save that wrote it.
 *
 * A sign-off acknowledged must leave the check-off signed by the preceptor, with its signature
 * row (record type "checkoff", the check-off's id, the preceptor as signer).
 */
import type { SubmittedAnswer } from "~/db/queries/exam-attempts.server";

/** "ack": 2xx with the app's ok reply; "refused": a 4xx (nothing written); "unknown": no reply, or a 5xx. */
export type Outcome = "pending" | "ack" | "refused" | "unknown";

export type SaveRecord = { seq: number; key: string; attemptId: string; position: number; fingerprint: string; sentAt: number; outcome: Outcome; ackAt?: number; status?: number };
export type SignRecord = { seq: number; checkoffId: string; sentAt: number; outcome: Outcome; ackAt?: number; status?: number };

/** A comparable form of an answer, the same for the answer sent and the answer stored. */
export function fingerprint(answer: unknown): string {
  if (answer === null || answer === undefined) return "empty";
  const a = answer as Partial<SubmittedAnswer> & { choices?: number[]; order?: number[]; text?: string; timeS?: number; choice?: number };
  switch (a.kind) {
    case "single":
      return `single:${a.choice}`;
    case "multiple":
      return `multiple:${[...(a.choices ?? [])].sort((x, y) => x - y).join(",")}`;
    case "ordering":
      return `ordering:${(a.order ?? []).join(",")}`;
    case "numeric":
      return `numeric:${String(a.text ?? "").trim()}`;
    case "waveform-point":
      return `waveform-point:${a.timeS}`;
    default:
      return `unknown:${JSON.stringify(answer)}`;
  }
}

export class Ledger {
  private seq = 0;
  readonly saves: SaveRecord[] = [];
  readonly signs: SignRecord[] = [];

  save(attemptId: string, position: number, answer: SubmittedAnswer): SaveRecord {
    const record: SaveRecord = { seq: this.seq++, key: `${attemptId}:${position}`, attemptId, position, fingerprint: fingerprint(answer), sentAt: performance.now(), outcome: "pending" };
    this.saves.push(record);
    return record;
  }

  sign(checkoffId: string): SignRecord {
    const record: SignRecord = { seq: this.seq++, checkoffId, sentAt: performance.now(), outcome: "pending" };
    this.signs.push(record);
    return record;
  }

  settle(record: SaveRecord | SignRecord, outcome: Outcome, status?: number): void {
    record.outcome = outcome;
    record.status = status;
    if (outcome === "ack") record.ackAt = performance.now();
  }

  inFlight(): number {
    return this.saves.filter((r) => r.outcome === "pending").length + this.signs.filter((r) => r.outcome === "pending").length;
  }

  acknowledged(before = Number.POSITIVE_INFINITY): { saves: SaveRecord[]; signs: SignRecord[] } {
    const acked = (r: { outcome: Outcome; ackAt?: number }) => r.outcome === "ack" && (r.ackAt ?? Number.POSITIVE_INFINITY) < before;
    return { saves: this.saves.filter(acked), signs: this.signs.filter(acked) };
  }
}

export type Verdict = {
  acknowledged: number;
  found: number;
  saves: { acknowledged: number; questions: number; superseded: number; found: number; heldByUnconfirmedLaterSave: number };
  signs: { acknowledged: number; found: number };
  /** One line per acknowledged write that is missing or holds another value. */
  missing: string[];
};

export type StoredState = {
  /** "attemptId:position" → fingerprint of the stored answer ("empty" when null). */
  answers: Map<string, string>;
  /** Check-off ids signed by the preceptor with a signature row and status signed/acknowledged. */
  signedCheckoffs: Set<string>;
};

/**
 * Compares the ledger with what a database holds. `before`: only writes acknowledged before this
 * instant (performance.now()) must be present — for a backup taken at that instant; later saves
 * of the same question (acknowledged or not) may already be in it.
 */
export function verify(ledger: Ledger, stored: StoredState, before = Number.POSITIVE_INFINITY): Verdict {
  const { saves: ackedSaves, signs: ackedSigns } = ledger.acknowledged(before);
  const byKey = new Map<string, SaveRecord[]>();
  for (const r of ledger.saves) {
    const list = byKey.get(r.key) ?? [];
    list.push(r);
    byKey.set(r.key, list);
  }
  const missing: string[] = [];
  let savesFound = 0;
  let superseded = 0;
  let heldByLater = 0;
  const lastAckedByKey = new Map<string, SaveRecord>();
  for (const r of ackedSaves) {
    const previous = lastAckedByKey.get(r.key);
    if (!previous || previous.seq < r.seq) lastAckedByKey.set(r.key, r);
  }
  const keyOk = new Map<string, boolean>();
  for (const [key, last] of lastAckedByKey) {
    const value = stored.answers.get(key);
    // Saves of this question sent after the last acknowledged one, which may have committed:
    // for the final check those never got a reply; for a backup, any not refused.
    const later = (byKey.get(key) ?? []).filter((r) => r.seq > last.seq && r.outcome !== "refused" && r.outcome !== "pending");
    const laterPending = (byKey.get(key) ?? []).filter((r) => r.seq > last.seq && r.outcome === "pending");
    if (value === last.fingerprint) keyOk.set(key, true);
    else if (value !== undefined && [...later, ...laterPending].some((r) => r.fingerprint === value)) {
      keyOk.set(key, true);
      heldByLater++;
    } else {
      keyOk.set(key, false);
      missing.push(`answer ${key}: acknowledged ${last.fingerprint} (save #${last.seq}), database holds ${value ?? "no row"}`);
    }
  }
  for (const r of ackedSaves) {
    if (lastAckedByKey.get(r.key) !== r) superseded++;
    if (keyOk.get(r.key)) savesFound++;
  }
  let signsFound = 0;
  for (const r of ackedSigns) {
    if (stored.signedCheckoffs.has(r.checkoffId)) signsFound++;
    else missing.push(`sign-off of check-off ${r.checkoffId} (#${r.seq}): acknowledged, but no preceptor signature on a signed record`);
  }
  return {
    acknowledged: ackedSaves.length + ackedSigns.length,
    found: savesFound + signsFound,
    saves: { acknowledged: ackedSaves.length, questions: lastAckedByKey.size, superseded, found: savesFound, heldByUnconfirmedLaterSave: heldByLater },
    signs: { acknowledged: ackedSigns.length, found: signsFound },
    missing,
  };
}
