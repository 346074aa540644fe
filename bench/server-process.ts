/**
 * Runs the real server (`node --import tsx server/main.ts`) in a child process on a database of the
 * benchmark's own, and samples its memory: worker threads live in the same process, so the
 * process's RSS covers the server and its image workers.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { join } from 'node:path';
import { REPO_ROOT } from './report';

/** A started server. */
export interface ServerProcess {
  readonly base: string;
  readonly pid: number;
  readonly child: ChildProcess;
  /** Stops it with SIGTERM (SIGKILL after 10 s) and waits for the exit. */
  stop(): Promise<void>;
}

/** A free TCP port on the loopback interface. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      probe.close(() => resolve(port));
    });
  });
}

async function waitForHealth(base: string, child: ChildProcess, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`the server exited with code ${child.exitCode}`);
    try {
      const res = await fetch(`${base}/api/health`);
      if (res.ok) return;
    } catch {
      // Not listening yet.
    }
    if (Date.now() > deadline) throw new Error(`the server did not answer within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/**
 * Starts the server on `dataDir` (database and uploads inside it), with no demo data, and waits
 * until /api/health answers. `env` adds or overrides variables (e.g. WORKERS); `nodeArgs` go to
 * node itself (e.g. --cpu-prof).
 */
export async function startServer(
  dataDir: string,
  env: Record<string, string> = {},
  nodeArgs: string[] = [],
): Promise<ServerProcess> {
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const child = spawn(process.execPath, [...nodeArgs, '--import', 'tsx', 'server/main.ts'], {
    cwd: REPO_ROOT,
    env: {
      ...process.env,
      PORT: String(port),
      HOST: '127.0.0.1',
      DATABASE_PATH: join(dataDir, 'maculo.sqlite'),
      UPLOADS_DIR: join(dataDir, 'uploads'),
      CLIENT_DIST: join(dataDir, 'no-client'),
      SESSION_SECRET: 'benchmark-session-secret-benchmark-session',
      SEED_DEMO: 'false',
      LOGIN_RATE_LIMIT: '1000',
      // The production default: one JSON log line per API request (written to /dev/null here).
      LOG_LEVEL: 'info',
      ...env,
    },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  if (child.pid === undefined) throw new Error('the server process did not start');
  try {
    await waitForHealth(base, child, 60_000);
  } catch (err) {
    child.kill('SIGKILL');
    throw err;
  }
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  return {
    base,
    pid: child.pid,
    child,
    async stop() {
      if (child.exitCode !== null) return;
      child.kill('SIGTERM');
      const timer = setTimeout(() => child.kill('SIGKILL'), 10_000);
      await exited;
      clearTimeout(timer);
    },
  };
}

function statusKb(pid: number, field: 'VmRSS' | 'VmHWM'): number {
  try {
    const match = new RegExp(`^${field}:\\s+(\\d+) kB`, 'm').exec(
      readFileSync(`/proc/${pid}/status`, 'utf8'),
    );
    return match ? Number(match[1]) : 0;
  } catch {
    return 0;
  }
}

/** RSS of a process sampled every `everyMs`, plus the kernel's own high-water mark (VmHWM). */
export class MemorySampler {
  private readonly timer: NodeJS.Timeout;
  private peakRssKb = 0;
  private hwmKb = 0;
  readonly samples: { t: number; rssMb: number }[] = [];
  private readonly started = performance.now();

  constructor(
    private readonly pid: number,
    everyMs = 100,
  ) {
    this.timer = setInterval(() => this.sample(), everyMs);
    this.timer.unref();
  }

  private sample(): void {
    const rss = statusKb(this.pid, 'VmRSS');
    if (rss === 0) return;
    this.peakRssKb = Math.max(this.peakRssKb, rss);
    this.hwmKb = Math.max(this.hwmKb, statusKb(this.pid, 'VmHWM'));
    // Keep one point a second for the report; the peak uses every sample.
    const t = (performance.now() - this.started) / 1000;
    const last = this.samples[this.samples.length - 1];
    if (!last || t - last.t >= 1) this.samples.push({ t: Math.round(t), rssMb: rss / 1024 });
  }

  /** Stops sampling (call before the process exits); peaks in MB. */
  stop(): { peakRssMb: number; vmHwmMb: number } {
    this.sample();
    clearInterval(this.timer);
    return { peakRssMb: this.peakRssKb / 1024, vmHwmMb: this.hwmKb / 1024 };
  }
}
