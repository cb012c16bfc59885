// Runs in a worker thread of lib/passwords.ts: bcrypt is CPU-bound JavaScript, so it must
// not run on the event loop that answers every other request. Plain JavaScript on purpose:
// a worker thread starts without the TypeScript loader of the main thread or of the tests.
import bcrypt from 'bcryptjs';

/** @param {{ op: 'hash', password: string, cost: number } | { op: 'compare', password: string, hash: string }} task */
export default function run(task) {
  if (task.op === 'hash') return bcrypt.hashSync(task.password, task.cost);
  return bcrypt.compareSync(task.password, task.hash);
}
