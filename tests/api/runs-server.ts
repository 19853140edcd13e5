/**
 * A built server on a data folder that outlives it (for the restart test and the benchmark): it may
 * be killed and started again on the same folder. Free of vitest, so benchmarks can use it too.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import type { Knex } from 'knex';
import { openDb } from '@/lib/server/db';
import { seedDemo } from '@/lib/server/seed';
import { freePort } from '../helpers/free-port';

/** The build under test: dist/ (npm test builds it), or QUADRILLE_TEST_DIST for a private build. */
const distDir = resolve(process.env.QUADRILLE_TEST_DIST ?? 'dist');
const entry = join(distDir, 'server/entry.mjs');
/** Our HTTP server around the built app (request timeouts fit long uploads). */
const serveScript = resolve('scripts/serve.mjs');

/** A built server on a data folder the test owns; it may be killed and started again on the same folder. */
export interface RunsServer {
  baseUrl: string;
  dataDir: string;
  db: Knex;
  process: ChildProcess;
  /** Everything the server printed. */
  output(): string;
  /** Kills the process (SIGKILL: no chance to clean up) and waits for it to exit. */
  kill(): Promise<void>;
  /** Stops the process (SIGTERM: a graceful shutdown); with `keepData` the folder and database handle stay for a restart. */
  stop(keepData?: boolean): Promise<void>;
}

/**
 * Starts the built server on `dataDir` (a fresh folder, migrated and seeded, when absent). With
 * `untouched` (an existing folder only) it waits for the server to say it listens and sends it no
 * request, so a test can see what the server does by itself.
 */
export async function startRunsServer(options: { dataDir?: string; env?: Record<string, string>; untouched?: boolean } = {}): Promise<RunsServer> {
  if (!existsSync(entry)) throw new Error('dist/server/entry.mjs is missing: run `npm run build` first (npm test does).');
  if (!existsSync(join(distDir, 'workers/run-worker.mjs'))) throw new Error('dist/workers/run-worker.mjs is missing: run `npm run build` first.');
  const dataDir = options.dataDir ?? mkdtempSync(join(tmpdir(), 'quadrille-runs-'));
  const db = openDb(dataDir);
  const port = await freePort();
  const child = spawn(process.execPath, [serveScript, entry], {
    // A stopped test server puts executing runs back at once unless a test asks for a grace period.
    env: { ...process.env, QUADRILLE_RUN_CONCURRENCY: '1', QUADRILLE_RUN_SHUTDOWN_GRACE_MS: '0', ...options.env, QUADRILLE_DATA_DIR: dataDir, HOST: '127.0.0.1', PORT: String(port), NODE_ENV: 'test' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout?.on('data', (chunk) => (output += chunk));
  child.stderr?.on('data', (chunk) => (output += chunk));
  const baseUrl = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 30_000;
  const giveUp = async (message: string): Promise<never> => {
    child.kill('SIGKILL');
    await db.destroy();
    if (!options.dataDir) rmSync(dataDir, { recursive: true, force: true });
    throw new Error(`${message}\n${output}`);
  };
  for (;;) {
    if (child.exitCode !== null) await giveUp(`server exited with code ${child.exitCode}`);
    if (options.untouched && options.dataDir) {
      if (/listening on/.test(output)) break;
    } else {
      try {
        if ((await fetch(`${baseUrl}/api/health`)).ok) break;
      } catch {
        // Not listening yet.
      }
    }
    if (Date.now() > deadline) await giveUp('server did not answer within 30 s');
    await sleep(100);
  }
  // The server migrates a fresh folder before answering its first request; the demo accounts follow.
  if (!options.dataDir) await seedDemo(db);
  const exited = () => new Promise<void>((done) => (child.exitCode !== null || child.signalCode !== null ? done() : child.once('exit', () => done())));
  return {
    baseUrl,
    dataDir,
    db,
    process: child,
    output: () => output,
    async kill() {
      child.kill('SIGKILL');
      await exited();
    },
    async stop(keepData = false) {
      if (child.exitCode === null && child.signalCode === null) {
        child.kill('SIGTERM');
        await exited();
      }
      if (!keepData) {
        await db.destroy();
        rmSync(dataDir, { recursive: true, force: true });
      }
    },
  };
}

export function sleep(ms: number): Promise<void> {
  return new Promise((wake) => setTimeout(wake, ms));
}

