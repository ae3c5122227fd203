/**
 * The alarm banner: coral, the word "Alarm" and a warning shape (never colour alone), each
 * alarm's name and reason. It lives in a role="alert" region that is always present; its text
 * changes only when the set of alarms changes (not every breath), so a screen reader announces
 * an alarm once rather than with every breath that repeats it.
 */
import { useRef } from "react";
import type { AlarmRecord, BreathReading } from "~/domain/bench/types";
import { ALARM_NAMES } from "~/components/waveform/reading-format";

interface Episode {
  key: string;
  sinceBreath: number;
  alarms: AlarmRecord[];
}

export function AlarmBanner({ latest }: { latest: { reading: BreathReading; alarms: AlarmRecord[] } | null }) {
  const key = latest ? latest.reading.alarms.join(",") : "";
  const episode = useRef<Episode | null>(null);
  if (!episode.current || episode.current.key !== key) {
    episode.current = { key, sinceBreath: latest?.reading.breath ?? 0, alarms: latest?.alarms ?? [] };
  }
  const { alarms, sinceBreath } = episode.current;
  return (
    <div role="alert">
      {alarms.length > 0 ? (
        <div className="mb-4 flex gap-3 rounded-lg border-2 border-l-8 border-coral bg-card px-4 py-3 text-ink">
          <svg aria-hidden="true" width="28" height="28" viewBox="0 0 24 24" className="mt-0.5 shrink-0">
            <path d="M12 2.5 23 21.5H1Z" fill="#B8432A" />
            <path d="M12 9v6" stroke="#FFFDF9" strokeWidth="2.4" strokeLinecap="round" />
            <circle cx="12" cy="18.2" r="1.4" fill="#FFFDF9" />
          </svg>
          <div>
            <p className="font-bold text-coral">
              Alarm <span className="font-normal text-ink">· since breath {sinceBreath}</span>
            </p>
            <ul className="mt-1 space-y-1">
              {alarms.map((a) => (
                <li key={a.kind}>
                  <strong className="font-semibold">{ALARM_NAMES[a.kind]}.</strong> {a.reason}
                </li>
              ))}
            </ul>
          </div>
        </div>
      ) : null}
    </div>
  );
}
