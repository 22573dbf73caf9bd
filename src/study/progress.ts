/**
 * Progress of a long study on stderr (stdout stays clean for --json): a redrawn bar on a terminal, plain lines
 * every ~2 s otherwise (logs, CI, job arrays).
 */
export interface ProgressSink {
  /** points finished so far in this run, out of `total` still to run when it started */
  update(done: number): void;
  finish(line: string): void;
}

export interface ProgressStream {
  isTTY?: boolean;
  columns?: number;
  write(text: string): unknown;
}

export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds)) return '?';
  const s = Math.round(seconds);
  if (s < 60) return `${s} s`;
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  return h > 0 ? `${h} h ${String(m).padStart(2, '0')} min` : `${m} min ${String(s % 60).padStart(2, '0')} s`;
}

export function makeProgress(stream: ProgressStream, total: number, label = 'sweep', now: () => number = () => performance.now()): ProgressSink {
  const started = now();
  const interval = stream.isTTY ? 100 : 2000;
  let lastShown = started;
  const describe = (done: number): { rate: number; left: string } => {
    const seconds = (now() - started) / 1000;
    const rate = seconds > 0 ? done / seconds : 0;
    return { rate, left: rate > 0 ? formatDuration((total - done) / rate) : '?' };
  };
  return {
    update(done) {
      const time = now();
      if (time - lastShown < interval && done < total) return;
      lastShown = time;
      const { rate, left } = describe(done);
      const percent = total > 0 ? (100 * done) / total : 100;
      const figures = `${done}/${total} ${percent.toFixed(1)}% ${rate.toFixed(0)} shots/s ${left} left`;
      if (stream.isTTY) {
        const width = Math.max(10, Math.min(40, (stream.columns ?? 80) - figures.length - label.length - 6));
        const filled = Math.round((width * done) / Math.max(total, 1));
        stream.write(`\r${label} [${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${figures}\x1b[K`);
      } else {
        stream.write(`${label}: ${figures}\n`);
      }
    },
    finish(line) {
      stream.write(`${stream.isTTY ? '\r\x1b[K' : ''}${line}\n`);
    },
  };
}

export const silentProgress: ProgressSink = { update() {}, finish() {} };
