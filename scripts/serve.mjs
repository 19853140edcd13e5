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
 */
import { existsSync, readFileSync } from 'node:fs';
import http from 'node:http';
import https from 'node:https';
import { dirname, resolve } from 'node:path';
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
const tls = process.env.SERVER_CERT_PATH && process.env.SERVER_KEY_PATH;
const server = tls
  ? https.createServer({ ...options, key: readFileSync(process.env.SERVER_KEY_PATH), cert: readFileSync(process.env.SERVER_CERT_PATH) }, handler)
  : http.createServer(options, handler);

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
