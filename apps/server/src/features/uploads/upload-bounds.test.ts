import { describe, expect, it } from 'vitest';
import { readCsv } from '@turnstone/dsp';
import { LineCounter } from './upload-bounds.ts';

// The streaming count must never be below the rows the CSV reader finds, or a file past
// the sample limit could slip through to the parser (common practice, no source).
describe('LineCounter', () => {
  const cases: [string, string][] = [
    ['LF', 'time,value\n0,1\n0.1,2\n0.2,3\n'],
    ['CRLF', 'time,value\r\n0,1\r\n0.1,2\r\n0.2,3'],
    ['CR only', '1\r2\r3\r4'],
    ['blank lines', '\n\n1\n\n\n2\n3\n\n'],
    ['no final newline', '1\n2\n3'],
  ];
  for (const [name, text] of cases) {
    it(`counts the rows the CSV reader reads (${name}), whatever the chunking`, () => {
      const bytes = new TextEncoder().encode(text);
      const csv = readCsv(text);
      const rows = csv.values.length + (csv.header ? 1 : 0);
      for (let size = 1; size <= bytes.length; size++) {
        const c = new LineCounter();
        for (let i = 0; i < bytes.length; i += size) c.push(bytes.subarray(i, i + size));
        expect(c.lines).toBe(rows);
      }
    });
  }
});
