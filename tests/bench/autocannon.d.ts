/**
 * The part of autocannon 9's API the bench uses (the package ships no types and
 * @types/autocannon is not installed). Shapes read from node_modules/autocannon/lib/run.js,
 * init.js and aggregateResult.js of 9.0.0.
 */
declare module "autocannon" {
  import type { EventEmitter } from "node:events";

  export interface Options {
    url: string;
    connections?: number;
    /** Seconds. */
    duration?: number;
    /** Seconds per request before it counts as a timeout. */
    timeout?: number;
    pipelining?: number;
    method?: string;
    headers?: Record<string, string>;
  }

  export interface Histogram {
    average: number;
    mean: number;
    stddev: number;
    min: number;
    max: number;
    total: number;
    p50: number;
    p90: number;
    p97_5: number;
    p99: number;
  }

  export interface Result {
    duration: number;
    errors: number;
    timeouts: number;
    non2xx: number;
    "2xx": number;
    statusCodeStats: Record<string, { count: number }>;
    latency: Histogram;
    requests: Histogram;
  }

  /** Emits "response" (client, statusCode, bytes, responseTimeMs) for every answer. */
  export interface Instance extends EventEmitter {
    stop(): void;
  }

  export default function autocannon(options: Options, callback: (error: Error | null, result: Result) => void): Instance;
}
