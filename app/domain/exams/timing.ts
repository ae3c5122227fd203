/**
 * How long a sitting lasts and when it must close. The deadline is the server's; the browser's
 * countdown only shows it. WCAG 2.2 SC 2.2.1 Timing Adjustable (W3C, 2023) asks that a time limit
 * can be turned off, adjusted to at least ten times, or extended after a warning of at least
 * 20 seconds: an accommodation gives a multiplier up to 10 or an untimed sitting, and the exam
 * page warns well before the end (WARNINGS_S).
 */
export const MIN_MULTIPLIER = 1.1;
export const MAX_MULTIPLIER = 10;

/** Seconds before the deadline at which the exam page announces the time left. */
export const WARNINGS_S = [300, 60] as const;

/**
 * An answer in flight when the clock runs out is still taken if it reaches the server within
 * this many seconds after the deadline (a save sent at the last second crosses the network).
 */
export const IN_FLIGHT_GRACE_S = 2;

export type TimingAccommodation = { kind: "multiplier"; multiplier: number } | { kind: "untimed" };

/** Seconds allowed for one sitting, or null for no limit (an untimed exam or sitting). */
export function allowedSeconds(timeLimitMinutes: number | null, accommodation: TimingAccommodation | null): number | null {
  if (timeLimitMinutes === null || timeLimitMinutes <= 0) return null;
  if (accommodation?.kind === "untimed") return null;
  const factor = accommodation?.kind === "multiplier" ? accommodation.multiplier : 1;
  return Math.ceil(timeLimitMinutes * 60 * factor);
}

export function deadlineFor(startedAt: Date, seconds: number | null): Date | null {
  return seconds === null ? null : new Date(startedAt.getTime() + seconds * 1000);
}

/** Is an answer arriving at `now` still in time for this deadline? */
export function acceptsAnswerAt(deadlineAt: Date | null, now: Date): boolean {
  return deadlineAt === null || now.getTime() <= deadlineAt.getTime() + IN_FLIGHT_GRACE_S * 1000;
}

/** Has the attempt's time run out, so the server closes and grades it? */
export function isPastDeadline(deadlineAt: Date | null, now: Date): boolean {
  return deadlineAt !== null && now.getTime() > deadlineAt.getTime() + IN_FLIGHT_GRACE_S * 1000;
}

/** "1 h 05 min", "12 min", "45 s": how a time limit reads on the start page. */
export function formatDuration(seconds: number): string {
  const s = Math.max(0, Math.round(seconds));
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  const r = s % 60;
  if (h > 0) return `${h} h ${String(m).padStart(2, "0")} min`;
  if (m > 0) return r ? `${m} min ${String(r).padStart(2, "0")} s` : `${m} min`;
  return `${r} s`;
}
