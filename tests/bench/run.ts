/**
 * `npm run bench`: the reference down-conversion (tests/bench/reference-ddc.chain.json) through
 * our command line and through the same chain in numpy/SciPy (tests/bench/ddc_scipy.py), on one
 * deterministic 2^24-sample cf32 capture at 10 Msps. Prints wall time, Msamples/s and peak RSS of
 * both, the ratio, and whether both find the same spectral peak.
 *
 * Options: --large also runs our CLI on 2^27 samples (1 GiB capture) to show that peak RSS stays
 * flat (off by default: it needs 1 GiB of temporary disk and about a minute);
 * --runs N repeats each timed run N times and reports the median (default 3); --keep keeps the
 * temporary directory. Wall time and RSS come from /usr/bin/time -v around each child process;
 * without it, wall time is measured here and RSS is reported only for SciPy (its own getrusage).
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { BENCH_SAMPLE_RATE, BENCH_TONE_HZ, writeBenchCapture } from './capture';

const here = dirname(fileURLToPath(import.meta.url));
const repo = resolve(here, '../..');
const chainPath = join(here, 'reference-ddc.chain.json');
const cliPath = join(repo, 'bin/quadrille.mjs');
const scipyPath = join(here, 'ddc_scipy.py');
const TIME = '/usr/bin/time';
const MiB = 1024 * 1024;

interface Measured { wallSeconds: number; cpuSeconds: number | null; peakRssBytes: number | null; stdout: string; stderr: string }
interface Outcome extends Measured { peakFrequency: number; peakLevel: number; innerSeconds: number; samples: number }

function argValue(name: string): string | undefined {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : undefined;
}

/** Run a child process under /usr/bin/time -v (when present); wall time and peak RSS. */
function measure(command: string, args: string[]): Promise<Measured> {
  const timed = existsSync(TIME);
  const [cmd, cmdArgs] = timed ? [TIME, ['-v', command, ...args]] : [command, args];
  return new Promise((resolvePromise, reject) => {
    const started = performance.now();
    const child = spawn(cmd, cmdArgs, { cwd: repo, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d) => (stdout += d));
    child.stderr.on('data', (d) => (stderr += d));
    child.on('error', reject);
    child.on('close', (code) => {
      const wallSeconds = (performance.now() - started) / 1000;
      if (code !== 0) return reject(new Error(`${command} ${args.join(' ')} exited with ${code}:\n${stderr}`));
      const rss = /Maximum resident set size \(kbytes\): (\d+)/.exec(stderr);
      const elapsed = /Elapsed \(wall clock\) time[^:]*: (?:(\d+):)?(\d+):(\d+(?:\.\d+)?)/.exec(stderr);
      const user = /User time \(seconds\): ([\d.]+)/.exec(stderr);
      const system = /System time \(seconds\): ([\d.]+)/.exec(stderr);
      const timeWall = elapsed ? Number(elapsed[1] ?? 0) * 3600 + Number(elapsed[2]) * 60 + Number(elapsed[3]) : null;
      resolvePromise({
        // /usr/bin/time's wall clock has 10 ms resolution; ours includes the spawn itself. Use ours.
        wallSeconds: timeWall === null ? wallSeconds : Math.max(wallSeconds, timeWall),
        cpuSeconds: user && system ? Number(user[1]) + Number(system[1]) : null,
        peakRssBytes: rss ? Number(rss[1]) * 1024 : null,
        stdout,
        stderr,
      });
    });
  });
}

async function runOurs(base: string, outDir: string): Promise<Outcome> {
  const m = await measure(process.execPath, [cliPath, 'run', '--chain', chainPath, '--input', `${base}.sigmf-meta`, '--out', outDir, '--quiet']);
  const results = JSON.parse(readFileSync(join(outDir, 'results.json'), 'utf8'));
  const probe = results.probes.find((p: { kind: string }) => p.kind === 'spectrum');
  if (!probe) throw new Error('results.json has no spectrum probe');
  return { ...m, peakFrequency: probe.spectrum.peak.frequency, peakLevel: probe.spectrum.peak.level, innerSeconds: results.timing.seconds, samples: results.input.samples };
}

async function runScipy(base: string): Promise<Outcome> {
  const m = await measure('python3', [scipyPath, `${base}.sigmf-data`, String(BENCH_SAMPLE_RATE)]);
  const r = JSON.parse(m.stdout.trim().split('\n').pop()!);
  return { ...m, peakRssBytes: m.peakRssBytes ?? r.peakRssBytes, peakFrequency: r.peakFrequency, peakLevel: r.peakLevel, innerSeconds: r.computeSeconds, samples: r.samples };
}

function median<T>(items: T[], key: (t: T) => number): T {
  const sorted = [...items].sort((a, b) => key(a) - key(b));
  return sorted[Math.floor(sorted.length / 2)];
}

type Repeated = Outcome & { rssMax: number | null; bestWall: number };

async function repeat(times: number, run: () => Promise<Outcome>): Promise<Repeated> {
  const all: Outcome[] = [];
  for (let k = 0; k < times; k++) all.push(await run());
  const rss = all.map((o) => o.peakRssBytes).filter((v): v is number => v !== null);
  return { ...median(all, (o) => o.wallSeconds), rssMax: rss.length ? Math.max(...rss) : null, bestWall: Math.min(...all.map((o) => o.wallSeconds)) };
}

const fmt = (v: number | null, digits = 2) => (v === null ? 'n/a' : v.toFixed(digits));

async function main(): Promise<void> {
  const runs = Math.max(1, Number(argValue('--runs') ?? 3));
  const large = process.argv.includes('--large') || process.env.QUADRILLE_BENCH_LARGE === '1';
  const dir = mkdtempSync(join(tmpdir(), 'quadrille-bench-'));
  try {
    const n = 2 ** 24;
    const base = join(dir, 'ddc-2p24');
    process.stderr.write(`generating ${n} complex samples (tone at +${BENCH_TONE_HZ / 1e6} MHz plus noise) in ${dir}\n`);
    writeBenchCapture(base, n);
    const warm = join(dir, 'warm');
    writeBenchCapture(warm, 1 << 16);
    // Untimed warm-up: fills tsx's transpile cache and the page cache for both tools.
    await runOurs(warm, join(dir, 'out-warm'));
    await runScipy(warm);

    process.stderr.write(`timing ${runs} run(s) of each\n`);
    const ours = await repeat(runs, () => runOurs(base, join(dir, 'out')));
    const scipy = await repeat(runs, () => runScipy(base));

    const bytes = statSync(`${base}.sigmf-data`).size;
    const binHz = BENCH_SAMPLE_RATE / 8 / 4096;
    const rows: [string, Repeated][] = [['quadrille CLI', ours], ['numpy/SciPy', scipy]];
    console.log(`\nreference DDC: ${n} (2^24) cf32 samples at ${BENCH_SAMPLE_RATE / 1e6} Msps, ${bytes / MiB} MiB; median of ${runs} run(s); load average ${loadavg().map((v) => v.toFixed(1)).join(' ')} on ${cpus().length} CPU(s)`);
    console.log('tool            wall s  Msamples/s   CPU s  compute s  peak RSS MiB     peak Hz  peak dBFS/Hz');
    for (const [name, o] of rows) {
      console.log(
        `${name.padEnd(14)}  ${fmt(o.wallSeconds, 3).padStart(6)}  ${fmt(n / o.wallSeconds / 1e6, 1).padStart(10)}  ${fmt(o.cpuSeconds, 2).padStart(6)}  ${fmt(o.innerSeconds, 3).padStart(9)}  ${fmt(o.rssMax === null ? null : o.rssMax / MiB, 1).padStart(12)}  ${o.peakFrequency.toFixed(2).padStart(10)}  ${o.peakLevel.toFixed(4).padStart(12)}`,
      );
    }
    console.log('(wall s, CPU s and RSS: whole child process incl. start-up; compute s: ours = run inside the CLI, SciPy = after imports)');
    const ratio = ours.wallSeconds / scipy.wallSeconds;
    const cpuRatio = ours.cpuSeconds !== null && scipy.cpuSeconds !== null ? ours.cpuSeconds / scipy.cpuSeconds : null;
    const computeRatio = ours.innerSeconds / scipy.innerSeconds;
    const msps = n / ours.wallSeconds / 1e6;
    const df = Math.abs(ours.peakFrequency - scipy.peakFrequency);
    const dl = Math.abs(ours.peakLevel - scipy.peakLevel);
    const verdict = (ok: boolean) => (ok ? 'OK' : 'MISS');
    console.log(`\nwall-time ratio ours/SciPy: ${ratio.toFixed(3)}  target <= 0.30  ${verdict(ratio <= 0.3)}`);
    // On a shared machine the fastest of several runs is the one least disturbed by other work.
    console.log(`best of ${runs}: ours ${ours.bestWall.toFixed(3)} s (${(n / ours.bestWall / 1e6).toFixed(1)} Msamples/s), SciPy ${scipy.bestWall.toFixed(3)} s, ratio ${(ours.bestWall / scipy.bestWall).toFixed(3)}`);
    console.log(`CPU-time ratio ours/SciPy: ${fmt(cpuRatio, 3)}   compute-time ratio: ${computeRatio.toFixed(3)}`);
    console.log(`throughput: ${msps.toFixed(1)} Msamples/s (whole process, wall)  target >= 20  ${verdict(msps >= 20)}`);
    if (ours.cpuSeconds !== null) {
      // On a shared machine wall time includes waiting for a core; CPU time is what a run costs.
      console.log(`throughput per CPU second: ${(n / ours.cpuSeconds / 1e6).toFixed(1)} Msamples/s (the wall figure if the process had a core to itself)`);
    }
    console.log(`peak RSS: ${fmt(ours.rssMax === null ? null : ours.rssMax / MiB, 1)} MiB  target <= 128  ${verdict(ours.rssMax !== null && ours.rssMax <= 128 * MiB)}`);
    console.log(`peaks agree: ${df.toFixed(3)} Hz apart (${(df / binHz).toFixed(4)} bin), ${dl.toFixed(4)} dB apart (limit 0.05 dB)  ${verdict(dl <= 0.05 && df <= 0.05 * binHz)}`);
    console.log(`expected tone after the mix: ${(BENCH_TONE_HZ - 1.25e6).toFixed(0)} Hz`);

    if (large) {
      const nl = 2 ** 27;
      const bigBase = join(dir, 'ddc-2p27');
      process.stderr.write(`generating ${nl} samples (${(nl * 8) / MiB} MiB) for the flat-RSS run\n`);
      writeBenchCapture(bigBase, nl);
      const big = await runOurs(bigBase, join(dir, 'out-large'));
      rmSync(`${bigBase}.sigmf-data`);
      console.log(`\nlarge run: ${nl} (2^27) samples: wall ${big.wallSeconds.toFixed(2)} s, ${(nl / big.wallSeconds / 1e6).toFixed(1)} Msamples/s, CPU ${fmt(big.cpuSeconds, 2)} s, peak RSS ${fmt(big.peakRssBytes === null ? null : big.peakRssBytes / MiB, 1)} MiB (2^24: ${fmt(ours.rssMax === null ? null : ours.rssMax / MiB, 1)} MiB)`);
      const flat = big.peakRssBytes !== null && ours.rssMax !== null && big.peakRssBytes <= ours.rssMax * 1.15 && big.peakRssBytes <= 128 * MiB;
      console.log(`RSS flat (2^27 within 15 % of 2^24 and <= 128 MiB): ${verdict(flat)}; peak ${big.peakFrequency.toFixed(2)} Hz at ${big.peakLevel.toFixed(4)} dBFS/Hz`);
    } else {
      console.log('\n(2^27-sample flat-RSS run skipped; add --large or QUADRILLE_BENCH_LARGE=1)');
    }
  } finally {
    if (!process.argv.includes('--keep')) rmSync(dir, { recursive: true, force: true });
    else process.stderr.write(`kept ${dir}\n`);
  }
}

main().catch((error) => {
  console.error(`bench: ${error instanceof Error ? error.message : String(error)}`);
  process.exitCode = 1;
});
