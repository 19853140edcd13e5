/**
 * Streams a run's output samples into the object store while the chain runs: blocks are encoded
 * as float32 little-endian (cf32_le for complex, rf32_le otherwise), hashed for the SigMF metadata
 * and fed to a put that pulls them with back-pressure, so a slow store slows the run instead of
 * filling memory.
 */
import { createHash } from 'node:crypto';
import { PassThrough } from 'node:stream';
import { SampleEncoder, formatSigmfMeta, sigmfShapeOfLayout } from '@/dsp/formats';
import type { StreamFormat } from '@/dsp/types';
import type { ObjectStore, PutResult } from '@/lib/server/storage';

/** Datatype an output of `format` is stored as: cf32_le for complex, rf32_le for real and real-pair. */
export function outputDatatype(format: StreamFormat): string {
  return format.sampleType === 'complex' ? 'cf32_le' : 'rf32_le';
}

export class OutputSink {
  private readonly stream = new PassThrough({ highWaterMark: 1 << 20 });
  private readonly putting: Promise<PutResult>;
  private putError: unknown = null;
  private encoder: SampleEncoder | null = null;
  private format: StreamFormat | null = null;
  private readonly hash = createHash('sha512');

  constructor(private readonly store: ObjectStore, readonly key: string) {
    this.putting = store.put(key, this.stream, { contentType: 'application/octet-stream' });
    this.putting.catch((error: unknown) => {
      this.putError = error;
      this.stream.destroy();
    });
  }

  /** Appends one output block (layout of `format`); resolves once the store can take more. */
  async write(block: Float32Array, format: StreamFormat): Promise<void> {
    if (this.putError) throw this.putError;
    if (!this.encoder) {
      this.format = format;
      this.encoder = new SampleEncoder({ kind: 'f', bits: 32, littleEndian: true }, format.sampleType);
    }
    // A fresh array each time: the stream keeps the chunk after this call returns.
    const bytes = this.encoder.encode(block);
    this.hash.update(bytes);
    if (this.stream.write(bytes)) return;
    await new Promise<void>((resume) => {
      const done = () => {
        this.stream.off('drain', done);
        this.stream.off('close', done);
        resume();
      };
      this.stream.once('drain', done);
      this.stream.once('close', done);
    });
    if (this.putError) throw this.putError;
  }

  /** Ends the data and waits for the object to be stored; answers its size and SigMF metadata text. */
  async finish(finalFormat: StreamFormat, description: string): Promise<{ bytes: number; samples: number; meta: string }> {
    this.stream.end();
    const stored = await this.putting;
    const format = this.format ?? finalFormat;
    const shape = sigmfShapeOfLayout(format.sampleType);
    const meta = formatSigmfMeta({
      global: {
        datatype: outputDatatype(format),
        version: '1.2.0',
        sampleRate: format.sampleRate,
        numChannels: shape.numChannels,
        sha512: this.hash.digest('hex'),
        description,
      },
      captures: [format.centerFrequency !== undefined ? { sampleStart: 0, frequency: format.centerFrequency } : { sampleStart: 0 }],
      annotations: [],
    });
    return { bytes: stored.bytes, samples: this.encoder?.samplesEncoded ?? 0, meta };
  }

  /** Stops the put (nothing is kept under the key) and removes anything that was stored. */
  async abort(reason: unknown): Promise<void> {
    this.stream.destroy(reason instanceof Error ? reason : new Error(String(reason)));
    // The put fails because its stream was destroyed just above: that is the point, not news.
    await this.putting.then(
      () => undefined,
      () => undefined,
    );
    try {
      await this.store.delete(this.key);
    } catch (error) {
      // The scheduler deletes the key again once the worker has answered; say why it may remain.
      console.error(`run worker: could not delete the partial output object ${this.key}:`, error);
    }
  }
}
