/**
 * Builds the worker-thread entries (workers/*-worker.ts) into plain ES modules beside the built
 * server (dist/workers/<name>.mjs): the built server runs without a TypeScript loader. npm
 * packages stay external and load from node_modules, like the server's own imports; the `@/`
 * alias resolves through tsconfig.json's paths. Also builds the configuration check that
 * scripts/serve.mjs runs first (dist/config/index.mjs). Usage: node scripts/build-workers.mjs [outDir]
 */
import { readdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { build } from 'esbuild';

const outDir = resolve(process.argv[2] ?? 'dist', 'workers');
const entries = readdirSync('workers')
  .filter((name) => name.endsWith('-worker.ts'))
  .map((name) => join('workers', name));

/** How every server-side bundle is made: ESM for Node 20, npm packages left to node_modules. */
const serverBundle = {
  outExtension: { '.js': '.mjs' },
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'esm',
  packages: 'external',
  tsconfig: 'tsconfig.json',
  sourcemap: false,
  logLevel: 'warning',
};

await build({ ...serverBundle, entryPoints: entries, outdir: outDir });
// The configuration schema, which scripts/serve.mjs checks before it loads the app.
await build({ ...serverBundle, entryPoints: { index: 'src/lib/config/index.ts' }, outdir: resolve(outDir, '..', 'config') });
console.log(`Built ${entries.length} worker entr${entries.length === 1 ? 'y' : 'ies'} into ${outDir}`);
