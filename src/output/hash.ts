/** SHA-256 of a file's bytes, read in chunks so a ten-million-row record is never held in memory at once. */
import { createHash } from 'node:crypto';
import { closeSync, openSync, readSync } from 'node:fs';

export function fileSha256(path: string): string {
  const hash = createHash('sha256');
  const buffer = Buffer.allocUnsafe(1 << 20);
  const fd = openSync(path, 'r');
  try {
    for (let read = readSync(fd, buffer, 0, buffer.length, null); read > 0; read = readSync(fd, buffer, 0, buffer.length, null)) {
      hash.update(buffer.subarray(0, read));
    }
  } finally {
    closeSync(fd);
  }
  return hash.digest('hex');
}
