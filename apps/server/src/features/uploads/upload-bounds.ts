/**
 * Bounds on an upload that hold before any parsing: the bytes (multer's file size limit),
 * the rows of a CSV counted while the file streams in (the upload is refused the moment it
 * passes the sample limit, without buffering the rest), and the frames of a WAV read from
 * its header. A refused upload is answered 413 with the limit in the message.
 */
import type { Request } from 'express';
import type multer from 'multer';
import { readWavLayout } from '@turnstone/dsp';
import { MAX_SAMPLES } from '@turnstone/contracts/ingest';
import { AppError } from '../../lib/app-error.ts';

export const MAX_UPLOAD_BYTES = 32 * 1024 * 1024;
const MIB = MAX_UPLOAD_BYTES / 1048576;

export function tooManySamples(count: number | string): string {
  return (
    `The recording holds ${count} samples; uploads are limited to ${MAX_SAMPLES} samples ` +
    `(and ${MIB} MiB). Shorten the recording or split it.`
  );
}

export const tooLarge = (message: string) => new AppError('payload_too_large', message, 413);

export function isWavBytes(bytes: Uint8Array): boolean {
  return (
    bytes.length >= 12 &&
    bytes[0] === 0x52 && // R
    bytes[1] === 0x49 && // I
    bytes[2] === 0x46 && // F
    bytes[3] === 0x46 && // F
    bytes[8] === 0x57 && // W
    bytes[9] === 0x41 && // A
    bytes[10] === 0x56 && // V
    bytes[11] === 0x45 // E
  );
}

export function looksLikeText(bytes: Uint8Array): boolean {
  const n = Math.min(bytes.length, 4096);
  for (let i = 0; i < n; i++) {
    const c = bytes[i]!;
    if (c === 0 || c < 9 || (c > 13 && c < 32 && c !== 27)) return false;
  }
  return true;
}

/**
 * Counts the non-empty lines of text fed in pieces (CR, LF or CRLF end a line; an empty
 * line is not a row, as the CSV reader skips it). One pass over the bytes, no strings.
 */
export class LineCounter {
  lines = 0;
  private inLine = false;
  push(chunk: Uint8Array): number {
    let { lines, inLine } = this;
    for (let i = 0; i < chunk.length; i++) {
      const c = chunk[i]!;
      if (c === 10 || c === 13) inLine = false;
      else if (!inLine) {
        inLine = true;
        lines++;
      }
    }
    this.lines = lines;
    this.inLine = inLine;
    return lines;
  }
}

/** A header row and the samples: more lines than this cannot be an acceptable CSV. */
export const MAX_CSV_LINES = MAX_SAMPLES + 1;

/** Refuses a WAV whose header announces more frames than the sample limit (413). */
export function checkWavFrames(bytes: Uint8Array): void {
  let frames: number;
  try {
    frames = readWavLayout(bytes).frames;
  } catch {
    return; // Not readable: the reader says why, with a 400.
  }
  if (frames > MAX_SAMPLES) throw tooLarge(tooManySamples(frames));
}

/**
 * multer storage that keeps the file in memory like multer.memoryStorage(), but counts the
 * rows of a text file as it arrives and stops at {@link MAX_CSV_LINES}: the rest of the
 * body is drained by multer and never kept.
 */
export function boundedMemoryStorage(): multer.StorageEngine {
  return {
    _handleFile(_req: Request, file, cb) {
      const chunks: Buffer[] = [];
      let size = 0;
      let kind: 'unknown' | 'wav' | 'text' = 'unknown';
      let head = Buffer.alloc(0);
      const counter = new LineCounter();
      let finished = false;
      const finish = (err: Error | null, info?: Partial<Express.Multer.File>) => {
        if (finished) return;
        finished = true;
        if (err) {
          chunks.length = 0;
          file.stream.removeListener('data', onData);
          file.stream.resume();
        }
        cb(err, info);
      };
      const onData = (chunk: Buffer) => {
        chunks.push(chunk);
        size += chunk.length;
        if (kind === 'unknown') {
          head = Buffer.concat([head, chunk]).subarray(0, 12);
          if (head.length < 12 && size < 12) return;
          kind = isWavBytes(head) ? 'wav' : 'text';
          if (kind === 'text') for (const c of chunks) counter.push(c);
        } else if (kind === 'text') counter.push(chunk);
        if (kind === 'text' && counter.lines > MAX_CSV_LINES)
          finish(tooLarge(tooManySamples(`more than ${MAX_SAMPLES}`)));
      };
      file.stream.on('data', onData);
      file.stream.on('error', (err: Error) => finish(err));
      file.stream.on('end', () => {
        const buffer = Buffer.concat(chunks, size);
        chunks.length = 0;
        finish(null, { buffer, size: buffer.length });
      });
    },
    _removeFile(_req: Request, file, cb) {
      (file as { buffer?: Buffer }).buffer = undefined;
      cb(null);
    },
  };
}
