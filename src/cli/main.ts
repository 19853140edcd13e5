/**
 * Quadrille command line: `quadrille run`, `quadrille inspect`, `quadrille --help`.
 * Output for people goes to stdout, progress and warnings to stderr; any failure is one line on
 * stderr and a non-zero exit (1 for bad input or a failed run, 2 for a bad command line, 130 when
 * interrupted), and a failed run leaves no output files behind.
 */
import { parseArgs } from 'node:util';
import { SIGMF_DATATYPES } from '../dsp/formats/datatype';
import { UsageError } from './errors';
import type { CaptureOptions } from './capture-source';
import { formatInspectReport, inspectCapture } from './inspect-command';
import { runCommand } from './run-command';
import { readSetting } from '../lib/config';

/** Milliseconds from process start until every module was loaded (QUADRILLE_TIMING=1 prints it). */
const MODULES_LOADED_MS = performance.now();
const MODULES_LOADED_CPU = process.cpuUsage();

const HELP = `Quadrille command line: run processing chains on radio captures.

Usage:
  quadrille run --chain CHAIN.json --input CAPTURE --out DIR [capture options] [--quiet]
  quadrille inspect CAPTURE [capture options] [--json]
  quadrille --help

CAPTURE is one of:
  NAME.sigmf-meta   SigMF metadata with NAME.sigmf-data beside it (or name the .sigmf-data)
  NAME.wav          WAV: PCM 8/16/24/32-bit or float32, 1 channel (real) or 2 (real-pair)
  anything else     raw samples, described by --datatype and --sample-rate

Capture options:
  --datatype TYPE           SigMF datatype of a raw file: r or c, then f32/f64/i32/i16/u32/u16
                            with _le or _be, or i8/u8 (e.g. cf32_le, ci16_le, ru8)
  --sample-rate HZ          samples per second (raw: required; others: overrides the file)
  --center-frequency HZ     RF frequency that 0 Hz stands for
  --layout LAYOUT           complex | real | real-pair (r datatypes: real-pair = two ADC channels;
                            a 2-channel WAV may be read as complex I = left, Q = right)
  --read-bytes N            bytes per read from the capture file (default 1 MiB)

run writes into DIR:
  results.json              engine version, input, every probe (stage id, kind; spectrum:
                            frequencies in Hz, levels, peak frequency/level; readouts: name,
                            value, unit), planned and run-time issues
  output.sigmf-meta/-data   the chain's final output, cf32_le (complex) or rf32_le (real)
  Files are written under temporary names and renamed at the end: a failed run leaves nothing.

Integer samples are scaled so full scale is 1.0: signed N-bit x / 2^(N-1), unsigned
(x - 2^(N-1)) / 2^(N-1) (u8: (x - 128) / 128).

Exit codes: 0 done, 1 bad input or failed run, 2 bad command line, 130 interrupted.`;

const CAPTURE_OPTIONS = {
  datatype: { type: 'string' },
  'sample-rate': { type: 'string' },
  'center-frequency': { type: 'string' },
  layout: { type: 'string' },
  'read-bytes': { type: 'string' },
} as const;

function numberOption(value: string | undefined, name: string): number | undefined {
  if (value === undefined) return undefined;
  const n = Number(value.trim().replace(/_/g, ''));
  if (value.trim() === '' || !Number.isFinite(n)) throw new UsageError(`--${name}: not a number: "${value}"`);
  return n;
}

function captureOptions(values: Record<string, string | boolean | undefined>): CaptureOptions {
  const str = (k: string) => values[k] as string | undefined;
  return {
    datatype: str('datatype'),
    sampleRate: numberOption(str('sample-rate'), 'sample-rate'),
    centerFrequency: numberOption(str('center-frequency'), 'center-frequency'),
    layout: str('layout'),
    readBytes: numberOption(str('read-bytes'), 'read-bytes'),
  };
}

function parse(args: string[], options: Record<string, { type: 'string' | 'boolean' }>) {
  try {
    return parseArgs({ args, options, allowPositionals: true, strict: true });
  } catch (error) {
    throw new UsageError((error as Error).message.split('\n')[0]);
  }
}

async function main(argv: string[]): Promise<number> {
  const [command, ...rest] = argv;
  if (command === undefined || command === '--help' || command === '-h' || command === 'help') {
    process.stdout.write(`${HELP}\n`);
    return command === undefined ? 2 : 0;
  }
  if (rest.includes('--help') || rest.includes('-h')) {
    process.stdout.write(`${HELP}\n`);
    return 0;
  }
  if (command === 'run') {
    const { values, positionals } = parse(rest, { ...CAPTURE_OPTIONS, chain: { type: 'string' }, input: { type: 'string' }, out: { type: 'string' }, quiet: { type: 'boolean' } });
    if (positionals.length > 0) throw new UsageError(`run: unexpected argument "${positionals[0]}"`);
    for (const name of ['chain', 'input', 'out'] as const) {
      if (typeof values[name] !== 'string' || values[name] === '') throw new UsageError(`run: --${name} is required (quadrille run --chain CHAIN.json --input CAPTURE --out DIR)`);
    }
    const controller = new AbortController();
    const onSignal = () => controller.abort();
    process.once('SIGINT', onSignal);
    process.once('SIGTERM', onSignal);
    await runCommand(
      { ...captureOptions(values), chain: values.chain as string, input: values.input as string, out: values.out as string, quiet: Boolean(values.quiet) },
      controller.signal,
    );
    return 0;
  }
  if (command === 'inspect') {
    const { values, positionals } = parse(rest, { ...CAPTURE_OPTIONS, json: { type: 'boolean' } });
    if (positionals.length !== 1) throw new UsageError('inspect: give exactly one CAPTURE (quadrille inspect CAPTURE)');
    const report = inspectCapture(positionals[0], captureOptions(values));
    process.stdout.write(values.json ? `${JSON.stringify(report, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2)}\n` : `${formatInspectReport(report)}\n`);
    return 0;
  }
  if (command === 'datatypes') {
    process.stdout.write(`${SIGMF_DATATYPES.join('\n')}\n`);
    return 0;
  }
  throw new UsageError(`unknown command "${command}" (commands: run, inspect; see quadrille --help)`);
}

/** One line for any error: its message, with the stage and sample of a chain failure. */
function describeError(error: unknown): string {
  if (!(error instanceof Error)) return String(error);
  if (error.name === 'AbortError') return 'interrupted; no output written';
  const e = error as Error & { stageId?: string; kind?: string; sampleIndex?: number };
  let message = error.message.replace(/\s*\n\s*/g, '; ');
  if (e.stageId !== undefined && !message.includes(e.stageId)) message = `stage "${e.stageId}" (${e.kind ?? '?'}): ${message}`;
  if (e.sampleIndex !== undefined && !/sample/.test(message)) message += ` (at input sample ${e.sampleIndex})`;
  return message;
}

main(process.argv.slice(2)).then(
  (code) => {
    if (readSetting('QUADRILLE_TIMING')) {
      const cpu = process.cpuUsage();
      process.stderr.write(`timing: start-up and module loading ${MODULES_LOADED_MS.toFixed(0)} ms (CPU ${((MODULES_LOADED_CPU.user + MODULES_LOADED_CPU.system) / 1000).toFixed(0)} ms), total ${performance.now().toFixed(0)} ms, CPU ${((cpu.user + cpu.system) / 1000).toFixed(0)} ms\n`);
    }
    process.exitCode = code;
  },
  (error: unknown) => {
    process.stderr.write(`quadrille: error: ${describeError(error)}\n`);
    if (readSetting('QUADRILLE_DEBUG') && error instanceof Error) process.stderr.write(`${error.stack}\n`);
    process.exitCode = error instanceof UsageError ? 2 : error instanceof Error && error.name === 'AbortError' ? 130 : 1;
  },
);
