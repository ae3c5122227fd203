/**
 * Runs a BenchRun in the browser: the trace sweeps in real time (requestAnimationFrame, redrawn
 * at most about 30 times a second), or — when the person prefers reduced motion — each breath
 * appears whole once its time has passed. Pause, resume, step one breath, one-tap changes and
 * starting a new run. The first render (server and browser alike) shows the run's prefilled
 * breaths, so nothing moves until JavaScript is running.
 */
import { useCallback, useEffect, useRef, useState } from "react";
import type { ChangeSet, Scenario } from "~/domain/bench/types";
import { BenchRun } from "./bench-run";

/** Redraw at most this often: smooth enough for a sweep, light on a tablet (common practice, no source). */
const FRAME_MS = 33;
/** A hidden tab pauses animation frames; on return, do not race through the missed breaths. */
const MAX_STEP_S = 0.25;

export function usePrefersReducedMotion(): boolean {
  const [reduced, setReduced] = useState(false);
  useEffect(() => {
    if (typeof window === "undefined" || !window.matchMedia) return;
    const query = window.matchMedia("(prefers-reduced-motion: reduce)");
    const update = () => setReduced(query.matches);
    update();
    query.addEventListener("change", update);
    return () => query.removeEventListener("change", update);
  }, []);
  return reduced;
}

export interface BenchRunner {
  run: BenchRun;
  paused: boolean;
  reducedMotion: boolean;
  /** Changes whenever the picture should be redrawn. */
  frame: number;
  pause(): void;
  resume(): void;
  stepBreath(): void;
  apply(set: ChangeSet): void;
  restart(scenario: Scenario): void;
}

export function useBenchRunner(initial: () => Scenario): BenchRunner {
  const [run, setRun] = useState(() => new BenchRun(initial()));
  const [paused, setPaused] = useState(false);
  const [frame, setFrame] = useState(0);
  const reducedMotion = usePrefersReducedMotion();
  const redraw = useCallback(() => setFrame((f) => f + 1), []);
  const runRef = useRef(run);
  runRef.current = run;

  useEffect(() => {
    if (paused || run.stopped) return;
    let cancelled = false;
    if (reducedMotion) {
      // One whole breath at a time, each shown when its own duration has passed.
      let timer: ReturnType<typeof setTimeout>;
      const next = () => {
        if (cancelled) return;
        run.stepBreath();
        redraw();
        if (!run.stopped) timer = setTimeout(next, Math.max(250, (run.latest()?.reading.durationS ?? 1) * 1000));
      };
      timer = setTimeout(next, Math.max(250, run.untilBreathEnds() * 1000 || 1000));
      return () => {
        cancelled = true;
        clearTimeout(timer);
      };
    }
    let handle = 0;
    let last = performance.now();
    let lastDrawn = 0;
    const tick = (now: number) => {
      if (cancelled) return;
      run.advance(Math.min(MAX_STEP_S, (now - last) / 1000));
      last = now;
      if (now - lastDrawn >= FRAME_MS) {
        lastDrawn = now;
        redraw();
      }
      if (!run.stopped) handle = requestAnimationFrame(tick);
      else redraw();
    };
    handle = requestAnimationFrame(tick);
    return () => {
      cancelled = true;
      cancelAnimationFrame(handle);
    };
  }, [run, paused, reducedMotion, redraw]);

  return {
    run,
    paused,
    reducedMotion,
    frame,
    pause: useCallback(() => setPaused(true), []),
    resume: useCallback(() => setPaused(false), []),
    stepBreath: useCallback(() => {
      runRef.current.stepBreath();
      redraw();
    }, [redraw]),
    apply: useCallback(
      (set: ChangeSet) => {
        runRef.current.apply(set);
        redraw();
      },
      [redraw],
    ),
    restart: useCallback((scenario: Scenario) => setRun(new BenchRun(scenario)), []),
  };
}
