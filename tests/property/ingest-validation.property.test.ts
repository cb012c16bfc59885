/**
 * The ingest fast path for base64 samples (decode, and skip the schema's pattern when the
 * bytes encode back to the same string) must judge every body exactly as the shared
 * schema does: same verdict, same issues, and the bytes a plain decode gives.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { snapshotInSchema } from '@turnstone/contracts/ingest';
import { parseSnapshot } from '../../apps/server/src/features/ingest/ingest-service.ts';
import { snapshotBody } from '../support/signals.ts';

const template = snapshotBody('MFP-P101-MDE-H', 'prop-1', {
  n: 256,
  takenAt: '2026-06-01T00:00:00.000Z',
});
const issues = (e: { issues: { path: PropertyKey[]; message: string }[] }) =>
  e.issues.map((i) => `${i.path.join('.')}: ${i.message}`);

function sameVerdict(body: Record<string, unknown>) {
  const fast = parseSnapshot(body);
  const reference = snapshotInSchema.safeParse(body);
  expect(fast.success).toBe(reference.success);
  if (fast.success && reference.success) {
    expect(fast.data).toEqual(reference.data);
    if (fast.bytes)
      expect(fast.bytes.equals(Buffer.from(body.samples as string, 'base64'))).toBe(true);
  } else if (!fast.success && !reference.success) {
    expect(issues(fast.error)).toEqual(issues(reference.error));
  }
}

// Base64 characters, padding, URL-safe and stray characters, whitespace.
const unit = fc.constantFrom(...'AQgw+/9z==-_ .!\n\u00e9');

describe('ingest validation of base64 samples', () => {
  it('judges arbitrary sample strings exactly as the shared schema', () => {
    fc.assert(
      fc.property(fc.string({ unit, maxLength: 64 }), (samples) => {
        sameVerdict({ ...template, samples });
      }),
      { numRuns: 2000 },
    );
  });

  it('judges encoded bytes, cut, padded or edited, exactly as the shared schema', () => {
    fc.assert(
      fc.property(
        fc.uint8Array({ maxLength: 700 }),
        fc.integer({ min: 0, max: 3 }),
        fc.option(fc.tuple(fc.nat(), unit)),
        fc.constantFrom({}, { encoding: 'int12' }, { sampleCount: 3 }, { extra: 1 }),
        (bytes, cut, edit, patch) => {
          let samples = Buffer.from(bytes).toString('base64');
          samples = samples.slice(0, Math.max(0, samples.length - cut));
          if (edit && samples.length > 0) {
            const at = edit[0] % samples.length;
            samples = samples.slice(0, at) + edit[1] + samples.slice(at + 1);
          }
          sameVerdict({ ...template, ...patch, samples });
        },
      ),
      { numRuns: 2000 },
    );
  });
});
