import { describe, expect, it } from 'vitest';
import {
  readRemembered,
  spanOnAxis,
  spectrumStart,
  startForBand,
  writeRemembered,
} from './spectrum-view.ts';

const faults = [
  { name: '1×', kind: 'shaft' as const, hz: 24.7, order: 1 },
  { name: 'DE 6205 BPFO', kind: 'bpfo' as const, hz: 88.5, order: 3.585 },
];

type Band = Parameters<typeof startForBand>[0];
/** Where the spectrum opens for the band `name` on `spectrum`, of its range's kind. */
const openOn = (name: string, spectrum: string, range: NonNullable<Band['range']>) =>
  startForBand({ name, spectrum, kind: range.kind, range }, faults);

describe('where the spectrum opens', () => {
  // Common practice, no source: 1× problems read on velocity over the low orders.
  it('an overall velocity band in alert opens velocity over 0–40 orders', () => {
    const s = openOn('Overall velocity', 'velocity', { kind: 'overall', fromHz: 10, toHz: 1000 });
    expect(s.measure).toBe('velocity');
    expect(s.span).toEqual({ unit: 'order', from: 0, to: 40 });
    // At 24.7 Hz running speed that is 0–988 Hz on a 0–5000 Hz axis.
    expect(spanOnAxis(s.span, 'hz', 24.7, 5000)).toEqual([0, expect.closeTo(988, 9)]);
  });

  it('a BPFO window with 3 harmonics on the envelope opens the envelope from 0 past its third harmonic', () => {
    const s = openOn('Envelope BPFO', 'envelope', {
      kind: 'fault',
      fault: 'bpfo',
      halfWidth: 5,
      halfWidthUnit: 'percent',
      harmonics: 3,
    });
    expect(s.measure).toBe('envelope');
    // 3 × 3.585 = 10.755 orders, + 5 % = 11.29, + 25 % margin = 14.12 orders.
    expect(s.span.unit).toBe('order');
    expect(s.span.to).toBeCloseTo(10.755 * 1.05 * 1.25, 9);
  });

  it('a Hz band opens on its range with a quarter of its width each side', () => {
    const s = openOn('Gear mesh', 'acceleration', { kind: 'hz', fromHz: 400, toHz: 600 });
    expect(s).toMatchObject({ measure: 'acceleration', span: { unit: 'hz', from: 350, to: 650 } });
    // Without a running speed an order span cannot be placed on a Hz axis.
    expect(spanOnAxis({ unit: 'order', from: 0, to: 40 }, 'hz', null, 5000)).toBeNull();
  });

  it('without a band: the user’s remembered view, else velocity 0–40 orders', () => {
    expect(spectrumStart(null, faults, null)).toMatchObject({
      measure: 'velocity',
      span: { unit: 'order', from: 0, to: 40 },
    });
    expect(spectrumStart(null, faults, { measure: 'envelope', spanOrders: 12 })).toMatchObject({
      measure: 'envelope',
      span: { unit: 'order', from: 0, to: 12 },
    });
  });

  it('the remembered view is kept per user, and a damaged entry is ignored', () => {
    const m = new Map<string, string>();
    const st = {
      getItem: (k: string) => m.get(k) ?? null,
      setItem: (k: string, v: string) => void m.set(k, v),
    };
    writeRemembered(st, 7, { measure: 'acceleration', spanOrders: 20 });
    expect(readRemembered(st, 7)).toEqual({ measure: 'acceleration', spanOrders: 20 });
    expect(readRemembered(st, 8)).toBeNull();
    m.set('turnstone.spectrum-view.7', '{"measure":"sound","spanOrders":3}');
    expect(readRemembered(st, 7)).toBeNull();
    m.set('turnstone.spectrum-view.7', 'not json');
    expect(readRemembered(st, 7)).toBeNull();
  });
});
