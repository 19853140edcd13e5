/**
 * `npm start`: bring the database up to date, seed the demo (unless QUADRILLE_DEMO=0), build the
 * app when dist/ is missing or older than the sources, then serve it and say where.
 */
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import knex from 'knex';
import { checkConfigAtStart } from '../src/lib/config';
import { dataDir, demoEnabled } from '../src/lib/server/config';
import { demoAccounts, demoPassword, seedDemo } from '../src/lib/server/seed';

const entry = 'dist/server/entry.mjs';
/** Inputs of `astro build`: when any is newer than the built entry, build again. */
const buildInputs = ['src', 'public', 'migrations', 'workers', 'astro.config.mjs', 'tailwind.config.mjs', 'tsconfig.json', 'package.json', 'package-lock.json'];

/** Newest modification time (ms) of a file or of any file below a folder. */
function newestChange(path: string): number {
  if (!existsSync(path)) return 0;
  const stats = statSync(path);
  if (!stats.isDirectory()) return stats.mtimeMs;
  return readdirSync(path).reduce((newest, name) => Math.max(newest, newestChange(join(path, name))), stats.mtimeMs);
}

/** Migrates and seeds; answers whether the demo accounts exist (so their credentials are worth printing). */
async function prepareDatabase(): Promise<boolean> {
  // Imported here, after the configuration check: the knexfile reads the data folder when it loads.
  const { default: knexfile } = await import('../knexfile');
  const db = knex(knexfile);
  try {
    const [, applied] = (await db.migrate.latest()) as [number, string[]];
    console.log(applied.length ? `Applied ${applied.length} migration(s) in ${dataDir()}` : `Database in ${dataDir()} is up to date.`);
    if (demoEnabled()) {
      const added = await seedDemo(db);
      if (added.length) console.log(`Seeded the Saltmarsh Telemetry demo: ${added.join(', ')}.`);
    }
    return Boolean(await db('users').where({ email: demoAccounts[0]!.email }).first());
  } finally {
    await db.destroy();
  }
}

function buildIfNeeded(): void {
  const builtAt = existsSync(entry) ? statSync(entry).mtimeMs : 0;
  const sourcesAt = Math.max(...buildInputs.map(newestChange));
  if (builtAt >= sourcesAt) return;
  console.log(builtAt ? 'Sources changed since the last build: building Quadrille...' : 'No build yet: building Quadrille (about half a minute)...');
  const build = spawnSync(process.execPath, ['node_modules/astro/astro.js', 'build'], { stdio: 'inherit' });
  // The run workers are built beside the server: it has no TypeScript loader to start them from source.
  const workers = build.status === 0 ? spawnSync(process.execPath, ['scripts/build-workers.mjs'], { stdio: 'inherit' }) : build;
  if (build.status !== 0 || workers.status !== 0) {
    console.error('The build failed; see the messages above.');
    process.exit((build.status || workers.status) ?? 1);
  }
}

async function waitForServer(url: string, timeoutMs = 60_000): Promise<boolean> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    try {
      if ((await fetch(`${url}/api/health`)).ok) return true;
    } catch {
      // Not listening yet.
    }
    await new Promise((wake) => setTimeout(wake, 150));
  }
  return false;
}

async function serve(showDemo: boolean): Promise<void> {
  const host = settings.HOST;
  const port = String(settings.PORT);
  const server = spawn(process.execPath, ['scripts/serve.mjs', entry], { stdio: 'inherit', env: { ...process.env, HOST: host, PORT: port } });
  for (const signal of ['SIGINT', 'SIGTERM'] as const) process.on(signal, () => server.kill(signal));
  server.on('exit', (code, signal) => process.exit(code ?? (signal ? 0 : 1)));
  const shownHost = host === '0.0.0.0' || host === '::' ? 'localhost' : host;
  const url = `http://${shownHost}:${port}`;
  if (!(await waitForServer(url))) {
    console.error(`Quadrille did not answer at ${url}.`);
    return;
  }
  console.log(`\nQuadrille is running at ${url}`);
  if (showDemo) {
    console.log(`Demo accounts (local demo only), password "${demoPassword}":`);
    for (const account of demoAccounts) console.log(`  ${account.role.padEnd(9)} ${account.email}`);
  }
  console.log('Press Ctrl+C to stop.');
}

// A bad variable stops here with one message naming it, before the database or the build is touched.
const settings = checkConfigAtStart();
const demoAccountsExist = await prepareDatabase();
buildIfNeeded();
await serve(demoAccountsExist && demoEnabled());
