/**
 * Password hashing (bcrypt) in a small worker-thread pool, never on the event loop: one
 * bcrypt at cost 11 is ~100 ms of CPU, and bcryptjs's async API still runs that JavaScript
 * on the main thread (it only yields between rounds), so a burst of sign-ins or link
 * submissions would stall every other request. The pool has at most `PASSWORD_THREADS`
 * threads and a bounded queue; past it a request is answered 503 at once instead of
 * queueing CPU work without end.
 */
import { availableParallelism } from 'node:os';
import { Piscina } from 'piscina';
import { AppError } from './app-error.ts';

export const BCRYPT_COST = 11;
/** Tasks waiting for a thread; more are refused (503 with Retry-After) rather than queued. */
export const PASSWORD_QUEUE_MAX = 32;

type Task =
  | { op: 'hash'; password: string; cost: number }
  | { op: 'compare'; password: string; hash: string };

let pool: Piscina<Task, string | boolean> | null = null;
let tasksRun = 0;

/** How many hashes and comparisons this process has handed to the pool (tests read it). */
export const passwordTasksRun = () => tasksRun;

function threads(): number {
  const asked = Number(process.env.PASSWORD_THREADS);
  if (Number.isInteger(asked) && asked >= 1 && asked <= 8) return asked;
  // Leave at least one core to the event loop and the database.
  return Math.max(1, Math.min(2, availableParallelism() - 1));
}

function thePool() {
  pool ??= new Piscina<Task, string | boolean>({
    filename: new URL('./password-worker.mjs', import.meta.url).href,
    minThreads: 0,
    maxThreads: threads(),
    maxQueue: PASSWORD_QUEUE_MAX,
    idleTimeout: 30_000,
  });
  return pool;
}

const busy = () =>
  new AppError(
    'busy',
    'Too many password checks at once. Try again in a few seconds.',
    503,
    undefined,
    {
      headers: { 'Retry-After': '5' },
    },
  );

async function runTask<T extends string | boolean>(task: Task): Promise<T> {
  const p = thePool();
  if (p.queueSize >= PASSWORD_QUEUE_MAX) throw busy();
  tasksRun++;
  try {
    return (await p.run(task)) as T;
  } catch (err) {
    if (err instanceof Error && /queue is at limit/i.test(err.message)) throw busy();
    throw err;
  }
}

export function hashPassword(password: string): Promise<string> {
  return runTask<string>({ op: 'hash', password, cost: BCRYPT_COST });
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return runTask<boolean>({ op: 'compare', password, hash });
}

/** Ends the pool's threads (tests and shutdown); the next call starts a new pool. */
export async function closePasswordPool(): Promise<void> {
  const p = pool;
  pool = null;
  await p?.destroy();
}
