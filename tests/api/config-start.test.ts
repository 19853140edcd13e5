/**
 * The built server checks its whole configuration before it listens: a bad value ends
 * scripts/serve.mjs at start with a non-zero exit code and a message naming the variable, rather
 * than on the first request that would read it.
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { freePort } from '../helpers/free-port';

const entry = resolve(process.env.QUADRILLE_TEST_ENTRY ?? 'dist/server/entry.mjs');
const serveScript = resolve('scripts/serve.mjs');
const folders: string[] = [];

afterEach(() => {
  for (const folder of folders.splice(0)) rmSync(folder, { recursive: true, force: true });
});

/** Starts the built server with `env` and resolves when it exits (a server that listens never does). */
async function startWith(env: Record<string, string>): Promise<{ code: number | null; output: string; dataDir: string }> {
  if (!existsSync(entry)) throw new Error('dist/server/entry.mjs is missing: run `npm run build` first.');
  const dataDir = mkdtempSync(join(tmpdir(), 'quadrille-config-'));
  folders.push(dataDir);
  const port = await freePort();
  const child = spawn(process.execPath, [serveScript, entry], {
    env: { ...process.env, QUADRILLE_DATA_DIR: dataDir, HOST: '127.0.0.1', PORT: String(port), NODE_ENV: 'test', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout.on('data', (chunk) => {
    output += chunk;
    // Listening means the check let the bad value through: stop it so the test fails at once.
    if (output.includes('listening')) child.kill();
  });
  child.stderr.on('data', (chunk) => (output += chunk));
  const code = await new Promise<number | null>((done) => child.once('exit', (exitCode) => done(exitCode)));
  return { code, output, dataDir };
}

describe('configuration check at start', () => {
  it.each([
    ['QUADRILLE_RUN_NICE', '40'],
    ['QUADRILLE_QUOTA_STORAGE_BYTES', '8GB'],
    ['QUADRILLE_STORAGE', 'ftp'],
    ['QUADRILLE_UPLOAD_EXPIRY_HOURS', 'soon'],
  ])('%s=%s stops the server before it listens, naming the variable', async (variable, value) => {
    const { code, output, dataDir } = await startWith({ [variable]: value });
    expect(code, output).not.toBe(0);
    expect(code, output).not.toBeNull();
    expect(output).toContain(variable);
    expect(output).toContain(`"${value}"`);
    expect(output).not.toContain('listening');
    // Stopped before the app loaded: no database was created in the data folder.
    expect(readdirSync(dataDir)).toEqual([]);
  });
});
