import { mkdirSync, readdirSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import path from "node:path";

/** One message as the fake keeps it: the fields the e-mail service's `GET /emails/:id` shows. */
export type OutboxMessage = {
  object: "email";
  id: string;
  from: string;
  to: string[];
  cc: string[];
  bcc: string[];
  reply_to: string[];
  subject: string;
  html: string | null;
  text: string | null;
  tags: { name: string; value: string }[];
  /** ISO instant, strictly increasing within one outbox so newest-first order never ties. */
  created_at: string;
};

/**
 * The outbox on disk: one JSON file per message under `<dataDir>/outbox/`, named
 * `<timestamp>_<id>.json` so a plain sort of the names is the order of sending.
 * Append-only by design — nothing here overwrites or removes a message.
 */
export function openOutbox(dataDir: string) {
  const folder = path.join(dataDir, "outbox");
  mkdirSync(folder, { recursive: true });
  const messages: OutboxMessage[] = [];

  for (const name of readdirSync(folder).filter((n) => n.endsWith(".json")).sort()) {
    try {
      messages.push(JSON.parse(readFileSync(path.join(folder, name), "utf8")) as OutboxMessage);
    } catch {
      // A damaged file must not stop the fake from starting; it stays on disk for a look.
      console.warn(`mail-fake: skipped unreadable outbox file ${name}`);
    }
  }
  let lastTime = messages.length ? Date.parse(messages[messages.length - 1].created_at) : 0;

  return {
    folder,
    append(message: Omit<OutboxMessage, "object" | "created_at">): OutboxMessage {
      // Two messages in the same millisecond would tie in both sort orders; nudge the clock.
      lastTime = Math.max(Date.now(), lastTime + 1);
      const stored: OutboxMessage = { object: "email", ...message, created_at: new Date(lastTime).toISOString() };
      const base = `${stored.created_at.replace(/[:.]/g, "-")}_${stored.id}`;
      // Write then rename, so a crash never leaves half a JSON file to trip the next start.
      const temporary = path.join(folder, `${base}.tmp`);
      writeFileSync(temporary, JSON.stringify(stored, null, 2));
      renameSync(temporary, path.join(folder, `${base}.json`));
      messages.push(stored);
      return stored;
    },
    /** Newest first, as `GET /emails` lists them. */
    list(): OutboxMessage[] {
      return [...messages].reverse();
    },
    find(id: string): OutboxMessage | undefined {
      return messages.find((m) => m.id === id);
    },
  };
}

export type Outbox = ReturnType<typeof openOutbox>;
