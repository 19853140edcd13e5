/**
 * Serves the built app: Astro's standalone handler (static files, then pages and API) inside an
 * HTTP server of our own, because the adapter's server keeps Node's default 5-minute limit on
 * receiving a request, which a multi-GiB one-request upload over an ordinary link cannot meet.
 *
 *   node scripts/serve.mjs [path/to/dist/server/entry.mjs]
 *
 * HOST and PORT as for the adapter (default localhost:4321); SERVER_CERT_PATH + SERVER_KEY_PATH
 * serve HTTPS; QUADRILLE_REQUEST_TIMEOUT_SECONDS (default 14400, 0 = none) bounds the time to
 * receive one request. Headers must still arrive within 60 s, so an idle connection cannot hold a
 * slot for long.
 *
 * Static assets with a brotli or gzip copy made at build time (scripts/precompress.mjs) are sent
 * compressed to browsers that accept it; everything else goes to Astro's handler (which compresses
 * large JSON answers itself, see src/lib/server/api/compress.ts).
 */
import { createReadStream, existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import http from 'node:http';
import https from 'node:https';
import { dirname, extname, join, relative, resolve, sep } from 'node:path';
import { pathToFileURL } from 'node:url';

const entry = resolve(process.argv[2] ?? 'dist/server/entry.mjs');
// The whole configuration is checked before the app loads, so a bad value stops the start with
// a message naming the variable (src/lib/config, built beside the server by build-workers.mjs).
const configModule = resolve(dirname(entry), '..', 'config', 'index.mjs');
if (!existsSync(configModule)) {
  console.error(`${configModule} is missing: build with \`npm run build\` (astro build, then node scripts/build-workers.mjs).`);
  process.exit(1);
}
const { checkConfigAtStart } = await import(pathToFileURL(configModule).href);
const seconds = checkConfigAtStart().QUADRILLE_REQUEST_TIMEOUT_SECONDS;

// The entry would start the adapter's own server on import; ours takes its place.
process.env.ASTRO_NODE_AUTOSTART = 'disabled';
const { handler } = await import(pathToFileURL(entry).href);

const requestTimeout = Math.round(seconds * 1000);
// Node checks for expired requests every connectionsCheckingInterval (default 30 s); a short
// limit is checked more often so it holds to within a quarter of itself.
const options = {
  requestTimeout,
  headersTimeout: requestTimeout > 0 ? Math.min(60_000, requestTimeout) : 60_000,
  connectionsCheckingInterval: requestTimeout > 0 ? Math.max(250, Math.min(30_000, requestTimeout / 4)) : 30_000,
};
/** Content types of the assets that have compressed copies (see compressible in scripts/precompress.mjs). */
const contentTypes = {
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.json': 'application/json; charset=utf-8',
  '.html': 'text/html; charset=utf-8',
  '.txt': 'text/plain; charset=utf-8',
  '.xml': 'application/xml',
  '.webmanifest': 'application/manifest+json',
};

const precompressed = indexPrecompressed(resolve(dirname(entry), '../client'));
const serveStatic = (request, response) => servePrecompressed(request, response) || handler(request, response);

const tls = process.env.SERVER_CERT_PATH && process.env.SERVER_KEY_PATH;
const server = tls
  ? https.createServer({ ...options, key: readFileSync(process.env.SERVER_KEY_PATH), cert: readFileSync(process.env.SERVER_CERT_PATH) }, serveStatic)
  : http.createServer(options, serveStatic);

const host = process.env.HOST ?? 'localhost';
const port = Number(process.env.PORT ?? 4321);
server.listen(port, host, () => {
  console.log(`Quadrille server listening on ${tls ? 'https' : 'http'}://${host}:${port}`);
  startUp();
});

/**
 * The app prepares itself (migrations, then the run scheduler) before it answers its first
 * request; asking it once now means queued runs start with the server, not with the first visitor.
 */
function startUp() {
  const address = server.address();
  const client = tls ? https : http;
  const request = client.get(
    { host: typeof address === 'object' && address ? address.address : host, port, path: '/api/health', rejectUnauthorized: false },
    (response) => {
      response.resume();
      if (response.statusCode !== 200) console.error(`Start-up check answered ${response.statusCode}`);
    },
  );
  request.on('error', (error) => console.error('Start-up check failed:', error.message));
}

// A signal stops new connections, lets executing runs finish within QUADRILLE_RUN_SHUTDOWN_GRACE_MS
// (then puts them back in the queue) and ends the process. A second signal ends it at once.
let stopping = false;
async function shutDown() {
  if (stopping) process.exit(1);
  stopping = true;
  server.close();
  server.closeIdleConnections?.();
  const hook = globalThis[Symbol.for('quadrille.shutdown')];
  try {
    if (typeof hook === 'function') await hook();
  } catch (error) {
    console.error('Shutdown did not finish cleanly:', error);
  }
  process.exit(0);
}
for (const signal of ['SIGINT', 'SIGTERM']) process.on(signal, () => void shutDown());


/** URL path -> the asset's file and its compressed copies, for every asset that has one. */
function indexPrecompressed(clientDir) {
  const index = new Map();
  if (!existsSync(clientDir)) return index;
  const walk = (dir) => {
    for (const name of readdirSync(dir)) {
      const path = join(dir, name);
      if (statSync(path).isDirectory()) {
        walk(path);
        continue;
      }
      const type = contentTypes[extname(path)];
      if (!type) continue;
      const copies = { br: `${path}.br`, gzip: `${path}.gz` };
      const available = Object.fromEntries(Object.entries(copies).filter(([, copy]) => existsSync(copy)).map(([coding, copy]) => [coding, { path: copy, size: statSync(copy).size }]));
      if (Object.keys(available).length === 0) continue;
      const urlPath = '/' + relative(clientDir, path).split(sep).join('/');
      index.set(urlPath, { type, copies: available });
    }
  };
  walk(clientDir);
  return index;
}

/** The best coding of `offered` that the Accept-Encoding header allows (brotli first), or null. */
function pickEncoding(acceptEncoding, offered) {
  const accepted = new Map();
  for (const part of String(acceptEncoding ?? '').split(',')) {
    const [name, ...params] = part.trim().toLowerCase().split(';');
    if (!name) continue;
    const q = params.map((p) => p.trim()).find((p) => p.startsWith('q='));
    accepted.set(name, q ? Number(q.slice(2)) : 1);
  }
  const allows = (coding) => (accepted.get(coding) ?? accepted.get('*') ?? 0) > 0;
  return ['br', 'gzip'].find((coding) => offered[coding] && allows(coding)) ?? null;
}

/** Sends a precompressed copy of a static asset when there is one and the client accepts it; answers whether it did. */
function servePrecompressed(request, response) {
  if (request.method !== 'GET' && request.method !== 'HEAD') return false;
  let pathname;
  try {
    pathname = decodeURIComponent(new URL(request.url ?? '/', 'http://localhost').pathname);
  } catch {
    return false;
  }
  const asset = precompressed.get(pathname);
  if (!asset) return false;
  // Caches must keep the compressed and the plain answer apart, whichever this one is.
  response.setHeader('Vary', 'Accept-Encoding');
  if (request.headers.range) return false;
  const coding = pickEncoding(request.headers['accept-encoding'], asset.copies);
  if (!coding) return false;
  const copy = asset.copies[coding];
  response.writeHead(200, {
    'Content-Type': asset.type,
    'Content-Encoding': coding,
    'Content-Length': copy.size,
    // Astro names bundled assets by content hash, so they never change; other files may.
    'Cache-Control': pathname.startsWith('/_astro/') ? 'public, max-age=31536000, immutable' : 'public, max-age=0, must-revalidate',
  });
  if (request.method === 'HEAD') response.end();
  else createReadStream(copy.path).pipe(response);
  return true;
}
