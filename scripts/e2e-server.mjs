// Starts the real server for browser tests on a fresh database seeded with the demo project.
import { rmSync, mkdirSync } from 'node:fs';
import { spawn } from 'node:child_process';
import { join } from 'node:path';

const root = new URL('..', import.meta.url).pathname;
const dir = join(root, 'tests/.tmp/e2e');
rmSync(dir, { recursive: true, force: true });
mkdirSync(dir, { recursive: true });
const port = process.env.E2E_PORT ?? '3210';

const child = spawn('npx', ['tsx', 'server/main.ts'], {
  cwd: root,
  stdio: 'inherit',
  env: {
    ...process.env,
    PORT: port,
    HOST: '127.0.0.1',
    PUBLIC_URL: `http://127.0.0.1:${port}`,
    DATABASE_PATH: join(dir, 'maculo.sqlite'),
    UPLOADS_DIR: join(dir, 'uploads'),
    // Painted demo photos survive between runs (the database and uploads do not).
    DEMO_CACHE_DIR: join(root, 'tests/.tmp/demo-cache'),
    SESSION_SECRET: 'browser-tests-secret-browser-tests-secret',
    LOGIN_RATE_LIMIT: '1000',
    LOG_LEVEL: 'warn',
    SEED_DEMO: 'true',
  },
});
for (const signal of ['SIGINT', 'SIGTERM']) process.on(signal, () => child.kill(signal));
child.on('exit', (code) => process.exit(code ?? 0));
