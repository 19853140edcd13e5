#!/usr/bin/env node
// Launcher for the Quadrille command line (src/cli/main.ts), with no build step for the user.
//
// Start-up is a large share of a short run, so the launcher bundles src/cli with esbuild into one
// module the first time it runs (and again whenever a source file under src/ changes), caches it
// under node_modules/.cache/quadrille/ and imports that: about 0.05 s of start-up instead of the
// 0.4-0.7 s of compiling ~200 modules on every start. When esbuild is unavailable it falls back to
// tsx's in-thread require hook (which is why src/cli and src/dsp avoid top-level await and
// import.meta).
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, renameSync, rmSync, statSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const require = createRequire(import.meta.url);
const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const entry = join(root, 'src', 'cli', 'main.ts');

/**
 * A debugging switch read the way src/lib/config reads it (looseFlag): this launcher runs before
 * any TypeScript can load, so it cannot import the schema.
 */
function switchedOn(name) {
  return !['', '0', 'false', 'no', 'off'].includes((process.env[name] ?? '').trim().toLowerCase());
}

/** A fingerprint of every TypeScript source the command line may import (path, size, mtime). */
function sourceFingerprint() {
  const hash = createHash('sha256');
  const walk = (dir) => {
    for (const item of readdirSync(dir, { withFileTypes: true }).sort((a, b) => a.name.localeCompare(b.name))) {
      const path = join(dir, item.name);
      if (item.isDirectory()) walk(path);
      else if (/\.(ts|mts|json)$/.test(item.name)) addFile(path);
    }
  };
  const addFile = (path) => {
    const s = statSync(path);
    hash.update(`${relative(root, path)}\0${s.size}\0${s.mtimeMs}\n`);
  };
  // src/lib/config and src/lib/units.ts: the CLI reads its QUADRILLE_TIMING/QUADRILLE_DEBUG through the configuration schema.
  for (const source of ['src/cli', 'src/dsp', 'src/types', 'src/lib/config', 'src/lib/units.ts']) {
    const path = join(root, source);
    if (!existsSync(path)) continue;
    if (statSync(path).isDirectory()) walk(path);
    else addFile(path);
  }
  return hash.digest('hex').slice(0, 16);
}

/** Path of an up-to-date bundle of the command line, or null when it cannot be built here. */
function bundledCli() {
  if (switchedOn('QUADRILLE_CLI_NO_BUNDLE')) return null;
  try {
    const cacheDir = join(root, 'node_modules', '.cache', 'quadrille');
    const bundle = join(cacheDir, `cli-${sourceFingerprint()}.mjs`);
    if (existsSync(bundle)) return bundle;
    const { buildSync } = require('esbuild');
    mkdirSync(cacheDir, { recursive: true });
    // Written under a unique name and renamed, so CLIs started in parallel never read half a file.
    const partial = `${bundle}.${process.pid}.partial`;
    buildSync({
      entryPoints: [entry],
      outfile: partial,
      bundle: true,
      platform: 'node',
      target: 'node20',
      format: 'esm',
      packages: 'external',
      tsconfig: join(root, 'tsconfig.json'),
      logLevel: 'silent',
    });
    renameSync(partial, bundle);
    for (const old of readdirSync(cacheDir)) {
      if (old.startsWith('cli-') && old.endsWith('.mjs') && join(cacheDir, old) !== bundle) rmSync(join(cacheDir, old), { force: true });
    }
    return bundle;
  } catch {
    return null;
  }
}

const bundle = bundledCli();
if (bundle) {
  await import(pathToFileURL(bundle).href);
} else {
  require('tsx/cjs/api').register();
  // tsx turns on source-mapped stack traces, which makes Node parse every module's inline map at
  // load time; the CLI prints one-line errors, so keep them off unless debugging.
  if (!switchedOn('QUADRILLE_DEBUG')) process.setSourceMapsEnabled(false);
  require('../src/cli/main.ts');
}
