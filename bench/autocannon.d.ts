// The part of autocannon 9's API the benchmarks use (the package ships no types).
declare module 'autocannon' {
  import type { EventEmitter } from 'node:events';

  /** One connection's request generator. */
  interface Client extends EventEmitter {
    setHeaders(headers: Record<string, string>): void;
  }

  /** hdr-histogram summary as autocannon reports it. */
  interface Histogram {
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

  interface Result {
    requests: Histogram;
    latency: Histogram;
    duration: number;
    errors: number;
    timeouts: number;
    non2xx: number;
  }

  interface Options {
    url: string;
    connections?: number;
    duration?: number;
    headers?: Record<string, string>;
    setupClient?: (client: Client) => void;
  }

  interface Instance extends EventEmitter {
    on(
      event: 'response',
      listener: (client: Client, status: number, bytes: number, ms: number) => void,
    ): this;
    stop(): void;
  }

  function autocannon(opts: Options, done: (err: unknown, result: Result) => void): Instance;
  export default autocannon;
}
