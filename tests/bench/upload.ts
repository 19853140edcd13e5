/**
 * `npm run bench:upload` (also part of `npm run bench`): uploads a generated 1 GiB capture over
 * loopback to the BUILT server with the one-request API (POST /api/captures, body streamed from a
 * generator, never held in memory) and reports the throughput and the server process's RSS growth
 * (VmRSS from /proc/<pid>/status sampled every 20 ms during the upload; peak minus the value just
 * before), the CPU time of the server (main thread and other threads, user and system) and of the
 * client. Each capture is deleted after its run. Targets: >= 200 MB/s (median run) and <= 64 MiB
 * of RSS growth (largest of the runs).
 *
 * Options: --size-mib N (default 1024); --runs N per datatype (default 3); --protocol
 * one-request|tus|both (default one-request; tus is the web page's resumable upload in 16 MiB
 * PATCHes, timed until the capture is stored); --datatype ci16_le|cf32_le (default: both, cf32_le also
 * exercises the NaN/infinity scan of float data); --data-dir FOLDER puts the temporary data
 * folder there (default the system temp folder; /dev/shm takes the disk out of the measurement,
 * since the local store fsyncs every capture before publishing it); --strict exits 1 when a
 * target is missed. Environment: BENCH_SERVER_NODE_ARGS adds Node options to the server (e.g.
 * `--import ./profile-hook.mjs` to profile it). Needs `npm run build` first; the data folder is
 * removed afterwards.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { createHash, randomBytes } from 'node:crypto';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { request } from 'node:http';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { freePort } from '../helpers/free-port';

const MiB = 1024 * 1024;
const entry = resolve('dist/server/entry.mjs');
/** Our HTTP server around the built app (request timeouts fit long uploads). */
const serveScript = resolve('scripts/serve.mjs');
const TARGET_MB_PER_S = 200;
const TARGET_RSS_MIB = 64;

function argValue(name: string): string | undefined {
  const at = process.argv.indexOf(name);
  return at >= 0 ? process.argv[at + 1] : undefined;
}

/** Resident set size of a process in bytes (Linux /proc). */
function rssBytes(pid: number): number {
  const status = readFileSync(`/proc/${pid}/status`, 'utf8');
  const match = /VmRSS:\s+(\d+)\s+kB/.exec(status);
  return match ? Number(match[1]) * 1024 : 0;
}

/** CPU time (user + system) a process has used, in seconds (Linux /proc, clock ticks of 10 ms). */
function cpuSeconds(pid: number): number {
  const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ');
  // After the command name: state is field 3, utime field 14 and stime field 15 (proc(5)).
  return (Number(fields[11]) + Number(fields[12])) / 100;
}

/** CPU seconds of a process's main thread and of all its other threads (libuv pool, V8 helpers), split user/system. */
function threadCpu(pid: number): Map<string, number> {
  const sums = new Map<string, number>();
  for (const task of readdirSync(`/proc/${pid}/task`)) {
    try {
      const name = task === String(pid) ? 'main' : 'other threads';
      const fields = readFileSync(`/proc/${pid}/task/${task}/stat`, 'utf8').split(') ')[1]!.split(' ');
      sums.set(`${name} user`, (sums.get(`${name} user`) ?? 0) + Number(fields[11]) / 100);
      sums.set(`${name} system`, (sums.get(`${name} system`) ?? 0) + Number(fields[12]) / 100);
    } catch {
      // thread ended between listing and reading
    }
  }
  return sums;
}

async function waitForHealth(baseUrl: string, child: ChildProcess): Promise<void> {
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`server exited with code ${child.exitCode}`);
    try {
      if ((await fetch(`${baseUrl}/api/health`)).ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((wake) => setTimeout(wake, 100));
  }
  throw new Error('server did not answer within 60 s');
}

/** One MiB of random sample data (finite floats for f32 data). */
function randomBlock(datatype: string): Buffer {
  return datatype === 'cf32_le' ? Buffer.from(Float32Array.from({ length: MiB / 4 }, () => Math.random() * 2 - 1).buffer) : randomBytes(MiB);
}

/**
 * The capture's bytes as 1 MiB chunks: `block` with the chunk number written into its first 8
 * bytes, so no two chunks are equal. The same block gives the same bytes, so the expected SHA-256
 * can be computed before the timed upload.
 */
function* captureChunks(totalBytes: number, block: Buffer): Generator<Buffer> {
  for (let sent = 0, index = 0; sent < totalBytes; sent += MiB, index++) {
    const chunk = Buffer.from(block.subarray(0, Math.min(MiB, totalBytes - sent)));
    // A small integer read as two float32 values is a denormal or zero: still finite.
    chunk.writeUInt32LE(index, 0);
    chunk.writeUInt32LE(0, 4);
    yield chunk;
  }
}

interface UploadResult {
  status: number;
  body: string;
  headers: Record<string, string | string[] | undefined>;
  seconds: number;
}

/** One HTTP request whose body is `chunks` (none: no body), sent with node:http honouring back-pressure. */
function sendChunks(url: string, method: string, headers: Record<string, string>, chunks: Iterable<Buffer>): Promise<UploadResult> {
  return new Promise((done, fail) => {
    const started = performance.now();
    const req = request(url, { method, headers });
    req.on('response', (response) => {
      let body = '';
      response.setEncoding('utf8');
      response.on('data', (text) => (body += text));
      response.on('end', () => done({ status: response.statusCode ?? 0, body, headers: response.headers, seconds: (performance.now() - started) / 1000 }));
    });
    req.on('error', fail);
    const iterator = chunks[Symbol.iterator]();
    const pump = () => {
      for (;;) {
        const next = iterator.next();
        if (next.done) {
          req.end();
          return;
        }
        if (!req.write(next.value)) {
          req.once('drain', pump);
          return;
        }
      }
    };
    pump();
  });
}

/** The first `count` chunks of an iterator (the rest stay in it). */
function* take(iterator: Iterator<Buffer>, count: number): Generator<Buffer> {
  for (let k = 0; k < count; k++) {
    const next = iterator.next();
    if (next.done) return;
    yield next.value;
  }
}

const description = (datatype: string, totalBytes: number) => ({
  name: `bench ${datatype} ${totalBytes / MiB} MiB`,
  datatype,
  layout: 'complex',
  sampleRate: '100000000',
  centerFrequency: '2412000000',
});

/** POST /api/captures with the whole capture as one streamed body (what scripts do). */
function uploadOneRequest(baseUrl: string, cookie: string, totalBytes: number, datatype: string, chunks: Iterable<Buffer>): Promise<UploadResult> {
  const d = description(datatype, totalBytes);
  const query = new URLSearchParams({ name: d.name, datatype, layout: d.layout, sample_rate: d.sampleRate, center_frequency: d.centerFrequency });
  return sendChunks(`${baseUrl}/api/captures?${query}`, 'POST', { cookie, 'content-type': 'application/octet-stream', 'content-length': String(totalBytes) }, chunks);
}

/** Bytes per PATCH of the resumable upload, as the web page sends them (upload-transfer.ts). */
const TUS_PIECE_BYTES = 16 * MiB;

/**
 * The resumable upload the web page makes (tus 1.0.0): create at /api/uploads, PATCH pieces of
 * 16 MiB, then GET /api/uploads/:id/capture, which stores the capture. Timed from the create to
 * the capture's answer.
 */
async function uploadTus(baseUrl: string, cookie: string, totalBytes: number, datatype: string, chunks: Iterable<Buffer>): Promise<UploadResult> {
  const started = performance.now();
  const tus = { cookie, origin: baseUrl, 'tus-resumable': '1.0.0' };
  const metadata = Object.entries({ ...description(datatype, totalBytes), visibility: 'private', tags: '', notes: '' })
    .map(([key, value]) => `${key} ${Buffer.from(value).toString('base64')}`)
    .join(',');
  const created = await sendChunks(`${baseUrl}/api/uploads`, 'POST', { ...tus, 'upload-length': String(totalBytes), 'upload-metadata': metadata }, []);
  const location = created.headers.location;
  if (created.status !== 201 || typeof location !== 'string') throw new Error(`tus create answered ${created.status}: ${created.body}`);
  const url = new URL(location, baseUrl).href;
  const iterator = chunks[Symbol.iterator]();
  for (let offset = 0; offset < totalBytes; offset += TUS_PIECE_BYTES) {
    const length = Math.min(TUS_PIECE_BYTES, totalBytes - offset);
    const patched = await sendChunks(
      url,
      'PATCH',
      { ...tus, 'upload-offset': String(offset), 'content-type': 'application/offset+octet-stream', 'content-length': String(length) },
      take(iterator, length / MiB),
    );
    if (patched.status !== 204) throw new Error(`tus PATCH at ${offset} answered ${patched.status}: ${patched.body}`);
  }
  const finished = await sendChunks(`${url}/capture`, 'GET', { cookie, accept: 'application/json' }, []);
  return { ...finished, status: finished.status === 200 ? 201 : finished.status, seconds: (performance.now() - started) / 1000 };
}

const protocols = { 'one-request': uploadOneRequest, tus: uploadTus } as const;
type Protocol = keyof typeof protocols;

async function benchDatatype(baseUrl: string, pid: number, cookie: string, sizeBytes: number, datatype: string, protocol: Protocol) {
  const block = randomBlock(datatype);
  const hash = createHash('sha256');
  for (const chunk of captureChunks(sizeBytes, block)) hash.update(chunk);
  const expected = hash.digest('hex');

  const before = rssBytes(pid);
  const cpuBefore = cpuSeconds(pid);
  const threadsBefore = threadCpu(pid);
  const clientBefore = process.cpuUsage();
  let peak = before;
  const sampler = setInterval(() => {
    try {
      peak = Math.max(peak, rssBytes(pid));
    } catch {
      // process gone; the upload will fail and say so
    }
  }, 20);
  let result: UploadResult;
  try {
    result = await protocols[protocol](baseUrl, cookie, sizeBytes, datatype, captureChunks(sizeBytes, block));
  } finally {
    clearInterval(sampler);
  }
  peak = Math.max(peak, rssBytes(pid));
  const serverCpu = cpuSeconds(pid) - cpuBefore;
  const clientUsage = process.cpuUsage(clientBefore);
  const clientCpu = (clientUsage.user + clientUsage.system) / 1e6;
  const threads = [...threadCpu(pid)].map(([name, seconds]) => [name, seconds - (threadsBefore.get(name) ?? 0)] as const).filter(([, seconds]) => seconds >= 0.05);
  if (result.status !== 201) throw new Error(`upload answered ${result.status}: ${result.body}`);
  const capture = JSON.parse(result.body) as { sha256: string; byteSize: number };
  if (capture.sha256 !== expected || capture.byteSize !== sizeBytes) {
    throw new Error(`stored capture differs: sha256 ${capture.sha256} (expected ${expected}), ${capture.byteSize} bytes`);
  }
  // Removed again so that the next run's upload is not refused by the quota and the disk stays free.
  const removed = await fetch(`${baseUrl}/api/captures/${(capture as { id?: string }).id}`, { method: 'DELETE', headers: { cookie, origin: baseUrl } });
  if (!removed.ok) throw new Error(`delete answered ${removed.status}: ${await removed.text()}`);
  const mbPerSecond = sizeBytes / 1e6 / result.seconds;
  const growthMiB = (peak - before) / MiB;
  return { protocol, datatype, seconds: result.seconds, mbPerSecond, serverCpu, clientCpu, threads, beforeMiB: before / MiB, peakMiB: peak / MiB, growthMiB };
}

async function main(): Promise<void> {
  if (!existsSync(entry)) throw new Error('dist/server/entry.mjs is missing: run `npx astro build` first.');
  const sizeBytes = Number(argValue('--size-mib') ?? 1024) * MiB;
  const runs = Math.max(1, Number(argValue('--runs') ?? 3));
  const protocolArg = argValue('--protocol') ?? 'one-request';
  const protocolNames = (protocolArg === 'both' ? ['one-request', 'tus'] : [protocolArg]) as Protocol[];
  for (const name of protocolNames) if (!(name in protocols)) throw new Error(`--protocol: "${name}" is not one-request, tus or both`);
  const datatypes = argValue('--datatype') ? [argValue('--datatype')!] : ['ci16_le', 'cf32_le'];
  const dataDir = mkdtempSync(join(argValue('--data-dir') ?? tmpdir(), 'quadrille-bench-upload-'));
  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  const child = spawn(process.execPath, [...(process.env.BENCH_SERVER_NODE_ARGS?.split(' ').filter(Boolean) ?? []), serveScript, entry], {
    env: {
      ...process.env,
      QUADRILLE_DATA_DIR: dataDir,
      QUADRILLE_STORAGE: 'local',
      QUADRILLE_DEMO: '0',
      QUADRILLE_QUOTA_STORAGE_BYTES: String(4 * sizeBytes + 64 * MiB),
      QUADRILLE_QUOTA_LARGEST_CAPTURE_BYTES: String(sizeBytes),
      HOST: '127.0.0.1',
      PORT: String(port),
      NODE_ENV: 'production',
    },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  const rows: Awaited<ReturnType<typeof benchDatatype>>[] = [];
  try {
    await waitForHealth(baseUrl, child);
    const setup = await fetch(`${baseUrl}/api/setup`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: baseUrl },
      body: JSON.stringify({ email: 'bench@quadrille.test', name: 'Bench', password: 'bench-password-1' }),
    });
    if (setup.status !== 201) throw new Error(`setup answered ${setup.status}: ${await setup.text()}`);
    const cookie = setup.headers.getSetCookie().map((line) => line.split(';')[0]).join('; ');
    // Warm-up: the first upload loads the capture code paths; the measured ones should not pay for it.
    for (const protocol of protocolNames) {
      const warm = await protocols[protocol](baseUrl, cookie, 4 * MiB, 'ci16_le', captureChunks(4 * MiB, randomBlock('ci16_le')));
      if (warm.status !== 201) throw new Error(`warm-up upload (${protocol}) answered ${warm.status}: ${warm.body}`);
    }
    for (const protocol of protocolNames) {
      for (const datatype of datatypes) {
        for (let run = 0; run < runs; run++) rows.push(await benchDatatype(baseUrl, child.pid!, cookie, sizeBytes, datatype, protocol));
      }
    }
  } finally {
    child.kill('SIGTERM');
    await new Promise((wake) => child.once('exit', wake));
    rmSync(dataDir, { recursive: true, force: true });
  }

  console.log(`\nUpload over loopback (${protocolNames.join(', ')}): ${sizeBytes / MiB} MiB per capture into ${dataDir}, ${runs} run(s) each, ${cpus().length} CPUs, load average ${loadavg()[0]!.toFixed(2)}`);
  console.log('protocol     datatype   seconds   MB/s  server CPU s  client CPU s  RSS before  RSS peak   growth   server CPU by thread');
  for (const row of rows) {
    console.log(
      `${row.protocol.padEnd(11)}  ${row.datatype.padEnd(9)}  ${row.seconds.toFixed(2).padStart(7)}  ${row.mbPerSecond.toFixed(0).padStart(5)}  ${row.serverCpu.toFixed(2).padStart(12)}  ${row.clientCpu.toFixed(2).padStart(12)}  ${row.beforeMiB.toFixed(1).padStart(8)} MiB ${row.peakMiB.toFixed(1).padStart(6)} MiB ${row.growthMiB.toFixed(1).padStart(5)} MiB  ${row.threads.map(([name, seconds]) => `${name} ${seconds.toFixed(2)}`).join(', ')}`,
    );
  }
  // Throughput: the median run (a single run swings with the disk's write-back); RSS: the worst
  // run. The speed target is the one-request API's; memory must stay flat on both paths.
  let missed = false;
  for (const protocol of protocolNames) {
    for (const datatype of datatypes) {
      const mine = rows.filter((row) => row.protocol === protocol && row.datatype === datatype);
      const speeds = mine.map((row) => row.mbPerSecond).sort((a, b) => a - b);
      const median = speeds[Math.floor(speeds.length / 2)]!;
      const worstGrowth = Math.max(...mine.map((row) => row.growthMiB));
      const speedOk = protocol !== 'one-request' || median >= TARGET_MB_PER_S;
      const ok = speedOk && worstGrowth <= TARGET_RSS_MIB;
      missed ||= !ok;
      const speedTarget = protocol === 'one-request' ? ` (target >= ${TARGET_MB_PER_S})` : '';
      console.log(`${protocol} ${datatype}: median ${median.toFixed(0)} MB/s${speedTarget}, largest RSS growth ${worstGrowth.toFixed(1)} MiB (target <= ${TARGET_RSS_MIB}): ${ok ? 'met' : 'MISSED'}`);
    }
  }
  if (missed && process.argv.includes('--strict')) process.exit(1);
}

await main();
