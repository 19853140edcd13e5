/**
 * Progress on stderr: a self-rewriting line on a terminal, otherwise one line per 10 % so logs
 * stay short. Never writes to stdout, which belongs to the command's real output.
 */
export class ProgressReporter {
  private readonly tty: boolean;
  private lastStep = -1;
  private lastDraw = 0;
  private readonly started = Date.now();
  private readonly quiet: boolean;

  constructor(quiet = false) {
    this.tty = Boolean(process.stderr.isTTY);
    this.quiet = quiet;
  }

  /** A line of information (also shown when quiet is off). */
  note(message: string): void {
    if (this.quiet) return;
    this.clearLine();
    process.stderr.write(`${message}\n`);
  }

  /** Report a fraction done (0..1) with the samples read so far. */
  update(fraction: number, samplesIn: number): void {
    if (this.quiet) return;
    const now = Date.now();
    const percent = Math.min(100, Math.max(0, fraction * 100));
    if (this.tty) {
      if (now - this.lastDraw < 100 && percent < 100) return;
      this.lastDraw = now;
      process.stderr.write(`\r${percent.toFixed(0).padStart(3)} %  ${samplesIn} samples  ${((now - this.started) / 1000).toFixed(1)} s`);
      return;
    }
    const step = Math.floor(percent / 10);
    if (step <= this.lastStep) return;
    this.lastStep = step;
    process.stderr.write(`progress: ${step * 10} % (${samplesIn} samples)\n`);
  }

  /** End the self-rewriting line. */
  done(): void {
    this.clearLine();
  }

  private clearLine(): void {
    if (this.tty && this.lastDraw > 0) {
      process.stderr.write('\r\x1b[K');
      this.lastDraw = 0;
    }
  }
}
