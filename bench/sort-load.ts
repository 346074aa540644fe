/**
 * Closed-loop load with autocannon: N connections, each signed in as its own reviewer (its own
 * session cookie), asking one URL again as soon as the answer arrives. Scenarios run in interleaved
 * slices (A B C A B C ...) so a change in the machine's other load falls on all of them alike.
 * Latencies are recorded per response, so the percentiles (p95 included) are exact.
 */
import autocannon from 'autocannon';
import { percentile, processCpuSeconds, round } from './report';

/** One URL to measure. */
export interface Scenario {
  name: string;
  path: string;
}

/** The figures of one scenario over all its slices. */
export interface ScenarioFigures {
  name: string;
  path: string;
  requests: number;
  seconds: number;
  requestsPerSecond: number;
  meanMs: number;
  p50Ms: number;
  p95Ms: number;
  p99Ms: number;
  maxMs: number;
  /** CPU time the server process spent per request (all its threads), from /proc. */
  serverCpuMsPerRequest: number;
  /** Answers by HTTP status (anything but 200 is a failed request). */
  statuses: Record<string, number>;
  /** Connection errors, timeouts (no answer within 10 s) included. */
  errors: number;
  timeouts: number;
}

interface Slice {
  latencies: number[];
  statuses: Map<number, number>;
  seconds: number;
  errors: number;
  timeouts: number;
  serverCpuSeconds: number;
}

function runSlice(
  url: string,
  cookies: string[],
  seconds: number,
  serverPid: number,
): Promise<Slice> {
  const cpu0 = processCpuSeconds(serverPid);
  return new Promise((resolve, reject) => {
    const latencies: number[] = [];
    const statuses = new Map<number, number>();
    let next = 0;
    const instance = autocannon(
      {
        url,
        connections: cookies.length,
        duration: seconds,
        setupClient: (client) => client.setHeaders({ cookie: cookies[next++ % cookies.length]! }),
      },
      (err, result) => {
        if (err) return reject(err instanceof Error ? err : new Error(String(err)));
        resolve({
          latencies,
          statuses,
          seconds: result.duration,
          errors: result.errors,
          timeouts: result.timeouts,
          serverCpuSeconds: processCpuSeconds(serverPid) - cpu0,
        });
      },
    );
    instance.on('response', (_client, status, _bytes, ms) => {
      latencies.push(ms);
      statuses.set(status, (statuses.get(status) ?? 0) + 1);
    });
  });
}

function summarise(scenario: Scenario, slices: Slice[]): ScenarioFigures {
  const latencies = slices.flatMap((s) => s.latencies);
  const seconds = slices.reduce((s, x) => s + x.seconds, 0);
  const statuses: Record<string, number> = {};
  for (const slice of slices) {
    for (const [status, n] of slice.statuses) statuses[status] = (statuses[status] ?? 0) + n;
  }
  return {
    ...scenario,
    requests: latencies.length,
    seconds: round(seconds, 2),
    requestsPerSecond: round(latencies.length / seconds, 1),
    meanMs: round(latencies.reduce((s, v) => s + v, 0) / latencies.length, 2),
    p50Ms: round(percentile(latencies, 50), 2),
    p95Ms: round(percentile(latencies, 95), 2),
    p99Ms: round(percentile(latencies, 99), 2),
    maxMs: round(Math.max(...latencies), 2),
    serverCpuMsPerRequest: round(
      (slices.reduce((s, x) => s + x.serverCpuSeconds, 0) * 1000) / latencies.length,
      3,
    ),
    statuses,
    errors: slices.reduce((s, x) => s + x.errors, 0),
    timeouts: slices.reduce((s, x) => s + x.timeouts, 0),
  };
}

/**
 * Measures every scenario for `seconds` in total, in `rounds` interleaved slices, after a
 * two-second warm-up of each; `cookies` holds one session cookie per connection, `serverPid` is
 * the server process whose CPU time is counted.
 */
export async function measureScenarios(
  base: string,
  serverPid: number,
  scenarios: Scenario[],
  cookies: string[],
  seconds: number,
  rounds: number,
  onSlice?: (name: string, round: number) => void,
): Promise<ScenarioFigures[]> {
  // Requests still queued in the server when a slice ends would otherwise be served during the
  // next slice: wait for an answer to /api/health, which queues behind them, before going on.
  const drained = async () => void (await (await fetch(`${base}/api/health`)).arrayBuffer());
  for (const s of scenarios) {
    await runSlice(`${base}${s.path}`, cookies, 2, serverPid);
    await drained();
  }
  const slices = new Map<string, Slice[]>(scenarios.map((s) => [s.name, []]));
  for (let r = 0; r < rounds; r++) {
    for (const s of scenarios) {
      onSlice?.(s.name, r);
      slices
        .get(s.name)!
        .push(await runSlice(`${base}${s.path}`, cookies, seconds / rounds, serverPid));
      await drained();
    }
  }
  return scenarios.map((s) => summarise(s, slices.get(s.name)!));
}
