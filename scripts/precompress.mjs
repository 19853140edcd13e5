/**
 * Writes a brotli (.br) and a gzip (.gz) copy beside every text asset of the built client, so
 * scripts/serve.mjs answers browsers with compressed files without compressing on each request.
 * Run by the `precompress` integration of astro.config.mjs after every `astro build`; by hand:
 *
 *   node scripts/precompress.mjs [dist/client]
 */
import { readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { extname, join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { brotliCompressSync, constants, gzipSync } from 'node:zlib';

/** Extensions worth compressing (fonts and images are compressed already). */
export const compressible = new Set(['.js', '.mjs', '.css', '.svg', '.json', '.html', '.txt', '.xml', '.webmanifest']);
/** Below this size (bytes) compression saves less than the header it costs. */
const minBytes = 1024;

function* files(dir) {
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) yield* files(path);
    else yield path;
  }
}

/** Compresses every compressible file of `dir` (recursively); answers how many files and their bytes before and after brotli. */
export function precompress(dir) {
  const totals = { files: 0, raw: 0, brotli: 0 };
  for (const path of files(dir)) {
    if (!compressible.has(extname(path))) continue;
    const raw = readFileSync(path);
    if (raw.length < minBytes) continue;
    const br = brotliCompressSync(raw, { params: { [constants.BROTLI_PARAM_QUALITY]: 11, [constants.BROTLI_PARAM_SIZE_HINT]: raw.length } });
    const gz = gzipSync(raw, { level: 9 });
    // serve.mjs only offers a copy that exists, so a copy that saves nothing is simply not written.
    if (br.length < raw.length) writeFileSync(`${path}.br`, br);
    if (gz.length < raw.length) writeFileSync(`${path}.gz`, gz);
    totals.files += 1;
    totals.raw += raw.length;
    totals.brotli += Math.min(br.length, raw.length);
  }
  return totals;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const dir = resolve(process.argv[2] ?? 'dist/client');
  const { files: count, raw, brotli } = precompress(dir);
  console.log(`Precompressed ${count} files in ${dir}: ${(raw / 1024).toFixed(0)} kB -> ${(brotli / 1024).toFixed(0)} kB (brotli)`);
}
