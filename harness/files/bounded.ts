// Reading an input file with its size known before any work: only regular files (a FIFO or a
// device would block or never end), at most a stated number of bytes (checked from the file's
// size before reading, and again while reading in case it grows). Used for every file a person
// hands Footing: scenarios, robots, CSV series, saved results and report series.

import { closeSync, constants, fstatSync, openSync, readSync, statSync, type Stats } from 'node:fs';
import { open, stat } from 'node:fs/promises';

/** The one place input size limits live. */
export const FILE_LIMITS = {
  /** Scenario, robot and CSV files: the bundled ones are a few kB; 2 MiB leaves room for big friction rasters. */
  inputFile_bytes: 2 * 1024 * 1024,
  /**
   * Friction raster CSV files, read as bytes by the raster scanner: a 1000 × 1000 raster (the
   * largest grid allowed) with 6-digit friction values is about 24 MB; 64 MiB leaves room for
   * longer numbers, comments and CRLF line ends.
   */
  rasterFile_bytes: 64 * 1024 * 1024,
  /** results.json and series files: a 22-scenario, 6-build suite writes well under 1 MB (common practice: 100× headroom). */
  resultFile_bytes: 64 * 1024 * 1024,
} as const;

/** Why a file was not read: the message names the limit or the kind of file. */
export class FileBoundError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'FileBoundError';
  }
}

export function describeFileKind(info: Stats): string {
  if (info.isDirectory()) return 'a folder';
  if (info.isFIFO()) return 'a FIFO (named pipe)';
  if (info.isSocket()) return 'a socket';
  if (info.isCharacterDevice() || info.isBlockDevice()) return 'a device';
  return 'not a regular file';
}

function tooBig(size: number, limit_bytes: number): FileBoundError {
  return new FileBoundError(`the file is ${size} bytes, more than the ${formatBytes(limit_bytes)} allowed (limit ${limit_bytes} bytes); nothing was parsed`);
}

export function formatBytes(bytes: number): string {
  if (bytes >= 1024 * 1024 && bytes % (1024 * 1024) === 0) return `${bytes / (1024 * 1024)} MiB`;
  if (bytes >= 1024 && bytes % 1024 === 0) return `${bytes / 1024} KiB`;
  return `${bytes} bytes`;
}

/**
 * The file's text (UTF-8), or a FileBoundError saying why not (other errors, e.g. ENOENT, pass
 * through with their code). Never blocks on a FIFO: the kind is checked before opening, and the
 * open is non-blocking in case the path was swapped in between.
 */
export async function readBoundedText(file: string, limit_bytes: number = FILE_LIMITS.inputFile_bytes): Promise<string> {
  return (await readBoundedBytes(file, limit_bytes)).toString('utf8');
}

/** The file's bytes, on the same terms as readBoundedText (the size is checked before reading). */
export async function readBoundedBytes(file: string, limit_bytes: number): Promise<Buffer> {
  checkKindAndSize(await stat(file), limit_bytes);
  const handle = await open(file, constants.O_RDONLY | constants.O_NONBLOCK);
  try {
    const info = await handle.stat();
    checkKindAndSize(info, limit_bytes);
    return await collect(limit_bytes, info.size, async (buffer, offset) => (await handle.read(buffer, offset, buffer.length - offset, null)).bytesRead);
  } finally {
    await handle.close();
  }
}

/** The same for synchronous readers (saved results and series files). */
export function readBoundedTextSync(file: string, limit_bytes: number = FILE_LIMITS.resultFile_bytes): string {
  checkKindAndSize(statSync(file), limit_bytes);
  const fd = openSync(file, constants.O_RDONLY | constants.O_NONBLOCK);
  try {
    checkKindAndSize(fstatSync(fd), limit_bytes);
    const chunks: Buffer[] = [];
    let total = 0;
    for (;;) {
      const chunk = Buffer.alloc(CHUNK_bytes);
      const bytesRead = readSync(fd, chunk, 0, chunk.length, null);
      if (bytesRead === 0) break;
      total += bytesRead;
      // A file that grows while it is read is held to the same limit.
      if (total > limit_bytes) throw tooBig(total, limit_bytes);
      chunks.push(chunk.subarray(0, bytesRead));
    }
    return Buffer.concat(chunks, total).toString('utf8');
  } finally {
    closeSync(fd);
  }
}

const CHUNK_bytes = 64 * 1024;

function checkKindAndSize(info: Stats, limit_bytes: number): void {
  if (!info.isFile()) throw new FileBoundError(`${describeFileKind(info)}, not a regular file (expected a regular file)`);
  if (info.size > limit_bytes) throw tooBig(info.size, limit_bytes);
}

/**
 * Reads into one buffer of the stated size (one copy, no chunk list for a large raster), then
 * chunks only if the file grew while it was read; a file that grows is held to the same limit.
 */
async function collect(limit_bytes: number, size_bytes: number, read: (buffer: Buffer, offset: number) => Promise<number>): Promise<Buffer> {
  const whole = Buffer.allocUnsafe(size_bytes);
  let filled = 0;
  while (filled < size_bytes) {
    const bytesRead = await read(whole, filled);
    if (bytesRead === 0) return whole.subarray(0, filled);
    filled += bytesRead;
  }
  const chunks: Buffer[] = [whole];
  let total = filled;
  for (;;) {
    const chunk = Buffer.alloc(CHUNK_bytes);
    const bytesRead = await read(chunk, 0);
    if (bytesRead === 0) break;
    total += bytesRead;
    if (total > limit_bytes) throw tooBig(total, limit_bytes);
    chunks.push(chunk.subarray(0, bytesRead));
  }
  return chunks.length === 1 ? whole : Buffer.concat(chunks, total);
}
