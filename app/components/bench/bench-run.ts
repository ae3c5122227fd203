/**
 * One run of the Bench page: the simulator (createBench) plus a display cursor that sweeps
 * through the breaths it has produced. Pure TypeScript, no React, so it is unit-tested in Node
 * and renders the same first frame on the server and in the browser.
 *
 * The simulator works a whole breath at a time (bench.nextBreath()). The run keeps exactly one
 * breath ahead of the cursor: the next breath is computed when the cursor reaches the end of
 * the last one, so an event applied while a breath is being drawn acts from the next breath —
 * the breath on screen was already delivered.
 */
import { createBench } from "~/domain/bench/engine";
import { concatWaveforms } from "~/domain/bench/waveform";
import type { AlarmRecord, Bench, BreathReading, ChangeSet, Patient, Scenario, Waveform } from "~/domain/bench/types";

export interface BreathChunk {
  reading: BreathReading;
  alarms: AlarmRecord[];
  samples: Waveform;
  /** First sample's time (a lead-in before the first breath included). */
  startS: number;
  /** When the next breath begins. */
  endS: number;
}

export interface RunView {
  waveform: Waveform;
  startS: number;
  endS: number;
  /** Finished breaths whose time overlaps the window, oldest first. */
  breaths: BreathReading[];
  latest: BreathChunk | null;
}

export interface RunOptions {
  /** Seconds of trace shown (a rolling window). */
  windowS?: number;
  /** Breaths simulated at once so the first frame (server-rendered) is meaningful. */
  prefillBreaths?: number;
}

const EPS = 1e-9;

export class BenchRun {
  readonly scenario: Scenario;
  readonly windowS: number;
  private readonly bench: Bench;
  private chunks: BreathChunk[] = [];
  cursorS = 0;
  /** "apnoea": no breath was triggered for APNOEA_S; the run cannot go on. */
  stopped: "apnoea" | null = null;

  constructor(scenario: Scenario, options: RunOptions = {}) {
    this.scenario = scenario;
    this.windowS = options.windowS ?? 15;
    // The engine sizes its first buffer from scenario.breaths; the page runs open-ended, so a
    // small first size (it grows by doubling) avoids allocating for breaths never drawn.
    this.bench = createBench({ ...scenario, breaths: Math.min(scenario.breaths, 20) });
    for (let i = 0; i < (options.prefillBreaths ?? 3); i++) this.stepBreath();
  }

  private lastEnd(): number {
    return this.chunks.length ? this.chunks[this.chunks.length - 1].endS : 0;
  }

  private compute(): boolean {
    if (this.stopped) return false;
    const step = this.bench.nextBreath();
    if (!step.reading) {
      this.stopped = "apnoea";
      return false;
    }
    const r = step.reading;
    this.chunks.push({
      reading: r,
      alarms: step.alarms,
      samples: step.samples,
      startS: step.samples.timeS.length ? Math.min(step.samples.timeS[0], r.startS) : r.startS,
      endS: r.startS + r.durationS,
    });
    // Keep two windows of history: enough for the plot, bounded memory on the page.
    const keepFrom = this.cursorS - 2 * this.windowS;
    while (this.chunks.length > 2 && this.chunks[0].endS < keepFrom) this.chunks.shift();
    return true;
  }

  /** Moves the cursor on by `seconds` of simulated time, computing breaths as it needs them. */
  advance(seconds: number): void {
    const target = this.cursorS + Math.max(0, seconds);
    while (this.lastEnd() < target - EPS && this.compute());
    this.cursorS = Math.min(target, this.lastEnd());
  }

  /** Completes the breath being drawn or, at a breath boundary, draws the next one whole. */
  stepBreath(): void {
    if (this.cursorS < this.lastEnd() - EPS) {
      this.cursorS = this.lastEnd();
      return;
    }
    if (this.compute()) this.cursorS = this.lastEnd();
  }

  /** Seconds until the breath being drawn is complete (or the length of the next one). */
  untilBreathEnds(): number {
    const left = this.lastEnd() - this.cursorS;
    return left > EPS ? left : 0;
  }

  /** A one-tap event or a settings change. The simulator stands at the end of the last breath
   *  it computed, so patient, settings and limit changes all act from the next breath drawn. */
  apply(set: ChangeSet): void {
    this.bench.apply(set);
  }

  /** The breath an event applied now first acts on. */
  nextBreathNumber(): number {
    return this.chunks.length ? this.chunks[this.chunks.length - 1].reading.breath + 1 : 1;
  }

  /** The patient as the simulator holds it now (after events and one-tap changes). */
  patient(): Patient {
    return this.bench.state().patient;
  }

  finished(): BreathChunk[] {
    return this.chunks.filter((c) => c.endS <= this.cursorS + EPS);
  }

  latest(): BreathChunk | null {
    const done = this.finished();
    return done.length ? done[done.length - 1] : null;
  }

  /** The rolling window ending at the cursor (or the first `windowS` seconds at the start). */
  view(): RunView {
    const endS = Math.max(this.cursorS, this.windowS);
    const startS = endS - this.windowS;
    const parts: Waveform[] = [];
    for (const c of this.chunks) {
      if (c.endS < startS || c.startS > this.cursorS) continue;
      parts.push(c.endS <= this.cursorS + EPS ? c.samples : upTo(c.samples, this.cursorS));
    }
    const finished = this.finished();
    return {
      waveform: concatWaveforms(parts),
      startS,
      endS,
      breaths: finished.filter((c) => c.endS > startS).map((c) => c.reading),
      latest: finished.length ? finished[finished.length - 1] : null,
    };
  }
}

/** Samples with time ≤ t (the part of a breath already swept). */
function upTo(w: Waveform, t: number): Waveform {
  let n = 0;
  let hi = w.timeS.length;
  while (n < hi) {
    const mid = (n + hi) >>> 1;
    if (w.timeS[mid] <= t) n = mid + 1;
    else hi = mid;
  }
  return {
    timeS: w.timeS.subarray(0, n),
    pressureCmH2O: w.pressureCmH2O.subarray(0, n),
    flowLpm: w.flowLpm.subarray(0, n),
    volumeMl: w.volumeMl.subarray(0, n),
  };
}
