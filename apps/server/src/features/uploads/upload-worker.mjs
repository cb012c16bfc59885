// Runs in a worker thread of upload-pool.ts: reading a recording is CPU-bound, so it must
// not run on the event loop that answers every other request. Plain JavaScript on purpose
// (a worker thread starts without the TypeScript loader of the main thread or of the
// tests): it loads the TypeScript reader through tsx's scoped import.
import { tsImport } from 'tsx/esm/api';

const reader = tsImport('./read-recording.ts', import.meta.url);

/** @param {import('./read-recording.ts').ReadRecordingInput} input */
export default async function run(input) {
  const { readRecording } = await reader;
  return readRecording(input);
}
