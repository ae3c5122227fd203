/**
 * Pause, resume and step one breath, and the one-tap events. Every button is at least 44 px
 * tall (touch at the bedside) and says in words what it will do.
 */
import type { Scenario } from "~/domain/bench/types";
import { buttonClass } from "~/components/ui/button";
import { ONE_TAPS, type OneTap } from "./one-tap-events";

export function RunControls(p: {
  paused: boolean;
  stopped: boolean;
  reducedMotion: boolean;
  onPause: () => void;
  onResume: () => void;
  onStep: () => void;
}) {
  return (
    <div className="flex flex-wrap items-center gap-2">
      {p.paused ? (
        <button type="button" className={buttonClass("primary", "min-w-28")} onClick={p.onResume} disabled={p.stopped}>
          <PlayShape /> Resume
        </button>
      ) : (
        <button type="button" className={buttonClass("primary", "min-w-28")} onClick={p.onPause} disabled={p.stopped}>
          <PauseShape /> Pause
        </button>
      )}
      <button type="button" className={buttonClass("secondary")} onClick={p.onStep} disabled={!p.paused || p.stopped}>
        Step one breath
      </button>
      <span className="text-sm text-muted">
        {p.stopped
          ? "Stopped: no breath for 20 s (apnoea). Change the settings or load an exercise."
          : p.paused
            ? "Paused. Step through one breath at a time."
            : p.reducedMotion
              ? "Running; each breath appears whole (reduced motion)."
              : "Running in real time."}
      </span>
    </div>
  );
}

export function OneTapEvents({ baseline, onTap }: { baseline: Scenario; onTap: (tap: OneTap) => void }) {
  return (
    <section aria-labelledby="events-heading" className="mt-4">
      <h2 id="events-heading" className="text-base font-semibold">
        Events <span className="font-normal text-muted">· each acts from the next breath</span>
      </h2>
      <ul className="mt-2 grid grid-cols-1 gap-2 sm:grid-cols-2 xl:grid-cols-3">
        {ONE_TAPS.map((tap) => (
          <li key={tap.id}>
            <button
              type="button"
              onClick={() => onTap(tap)}
              className="flex min-h-11 w-full flex-col items-start rounded-md border border-sea bg-card px-3 py-2 text-left hover:bg-sea-wash"
            >
              <span className="font-semibold text-sea">{tap.label}</span>
              <span className="text-sm text-muted">{tap.detail(baseline)}</span>
            </button>
          </li>
        ))}
      </ul>
    </section>
  );
}

function PauseShape() {
  return (
    <svg aria-hidden="true" width="14" height="14" viewBox="0 0 14 14">
      <rect x="2" y="1.5" width="3.5" height="11" rx="1" fill="currentColor" />
      <rect x="8.5" y="1.5" width="3.5" height="11" rx="1" fill="currentColor" />
    </svg>
  );
}

function PlayShape() {
  return (
    <svg aria-hidden="true" width="14" height="14" viewBox="0 0 14 14">
      <path d="M3 1.5v11l9-5.5Z" fill="currentColor" />
    </svg>
  );
}
