/** Helpers for the command-line tests: run the CLI as a child process, write small captures. */
import { spawn } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';

const repo = resolve(__dirname, '..');
const cli = join(repo, 'bin/quadrille.mjs');

export interface CliResult { code: number | null; stdout: string; stderr: string }

/** Run `quadrille ARGS...` in a child process (async, so the test runner stays responsive). */
export function quadrille(...args: string[]): Promise<CliResult> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [cli, ...args], { cwd: repo, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.setEncoding('utf8').on('data', (d: string) => (stdout += d));
    child.stderr.setEncoding('utf8').on('data', (d: string) => (stderr += d));
    child.on('error', reject);
    child.on('close', (code) => resolve({ code, stdout, stderr }));
  });
}

/** Interleaved complex tone A e^{j 2 pi f n / fs} (+ optional DC on I). */
export function complexTone(samples: number, sampleRate: number, frequency: number, amplitude = 0.5): Float32Array {
  const out = new Float32Array(2 * samples);
  for (let n = 0; n < samples; n++) {
    const phase = 2 * Math.PI * ((n * frequency / sampleRate) % 1);
    out[2 * n] = amplitude * Math.cos(phase);
    out[2 * n + 1] = amplitude * Math.sin(phase);
  }
  return out;
}

/** Write BASE.sigmf-data (cf32_le) and BASE.sigmf-meta. */
export function writeSigmf(base: string, values: Float32Array, sampleRate: number, extraGlobal: Record<string, unknown> = {}, datatype = 'cf32_le', frequency?: number): void {
  writeFileSync(`${base}.sigmf-data`, new Uint8Array(values.buffer, values.byteOffset, values.byteLength));
  writeFileSync(`${base}.sigmf-meta`, JSON.stringify({
    global: { 'core:datatype': datatype, 'core:version': '1.2.0', 'core:sample_rate': sampleRate, ...extraGlobal },
    captures: [frequency === undefined ? { 'core:sample_start': 0 } : { 'core:sample_start': 0, 'core:frequency': frequency }],
    annotations: [],
  }));
}

/** Write a chain document and return its path. */
export function writeChain(dir: string, name: string, stages: unknown[]): string {
  const path = join(dir, name);
  writeFileSync(path, JSON.stringify({ version: 1, name, stages }));
  return path;
}
