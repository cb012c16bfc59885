/**
 * Where uploads are read (upload-worker.mjs in a small worker-thread pool, so the event loop
 * keeps answering) and how many may be in flight: {@link UPLOADS_PER_USER} per user (more
 * answer 429) and {@link UPLOADS_IN_FLIGHT} in all (more answer 503), both with Retry-After.
 * Counting starts before the body is read, so a refused upload costs no memory.
 */
import { availableParallelism } from 'node:os';
import { Piscina } from 'piscina';
import { AppError } from '../../lib/app-error.ts';
import type { ReadRecordingInput, ReadRecordingResult } from './read-recording.ts';

/** Uploads one user may have in flight at once. */
export const UPLOADS_PER_USER = 2;
/** Uploads the server takes at once, from everyone (each may hold up to 32 MiB). */
export const UPLOADS_IN_FLIGHT = 4;
/** Seconds a refused uploader is told to wait: about what reading a large file takes. */
export const UPLOAD_RETRY_AFTER_S = 10;

let pool: Piscina<ReadRecordingInput, ReadRecordingResult> | null = null;

function thePool() {
  pool ??= new Piscina<ReadRecordingInput, ReadRecordingResult>({
    filename: new URL('./upload-worker.mjs', import.meta.url).href,
    minThreads: 0,
    // Leave at least one core to the event loop and the database.
    maxThreads: Math.max(1, Math.min(2, availableParallelism() - 1)),
    idleTimeout: 30_000,
  });
  return pool;
}

/** Reads the recording in a worker thread. */
export function readRecordingOffThread(input: ReadRecordingInput): Promise<ReadRecordingResult> {
  return thePool().run(input);
}

/** Ends the pool's threads (tests and shutdown); the next upload starts a new pool. */
export async function closeUploadPool(): Promise<void> {
  const p = pool;
  pool = null;
  await p?.destroy();
}

const inFlight = new Map<number, number>();
let total = 0;

/** Uploads in flight now, in all (tests read it). */
export const uploadsInFlight = () => total;

/**
 * Takes a slot for one upload of `userId`, or throws 429 (this user has
 * {@link UPLOADS_PER_USER} running) / 503 (the server has {@link UPLOADS_IN_FLIGHT}).
 * Returns the release, to call exactly once when the upload is answered.
 */
export function takeUploadSlot(userId: number): () => void {
  const mine = inFlight.get(userId) ?? 0;
  const headers = { 'Retry-After': String(UPLOAD_RETRY_AFTER_S) };
  if (mine >= UPLOADS_PER_USER)
    throw new AppError(
      'too_many_uploads',
      `You have ${mine} uploads running; at most ${UPLOADS_PER_USER} at a time. Try again when one has finished.`,
      429,
      undefined,
      { headers },
    );
  if (total >= UPLOADS_IN_FLIGHT)
    throw new AppError(
      'busy',
      `The server is reading ${total} uploads, its limit at once. Try again in ${UPLOAD_RETRY_AFTER_S} seconds.`,
      503,
      undefined,
      { headers },
    );
  inFlight.set(userId, mine + 1);
  total++;
  let released = false;
  return () => {
    if (released) return;
    released = true;
    total--;
    const left = (inFlight.get(userId) ?? 1) - 1;
    if (left > 0) inFlight.set(userId, left);
    else inFlight.delete(userId);
  };
}
