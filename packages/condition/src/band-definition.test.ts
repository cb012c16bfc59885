import { describe, it, expect } from 'vitest';
import { checkBandDefinition, type BandDefinition } from './band-definition.ts';
import { bpfoEnvelope } from './test-bands.ts';

const good: BandDefinition = bpfoEnvelope(0.2, 0.5);
const fields = (band: BandDefinition) => checkBandDefinition(band).map((p) => p.field);

describe('checkBandDefinition', () => {
  it('when a band is well formed, there are no problems', () => {
    expect(checkBandDefinition(good)).toEqual([]);
  });

  it('when danger is not above alert, the danger level is named', () => {
    expect(fields({ ...good, dangerLevel: 0.2 })).toEqual(['dangerLevel']);
  });

  it('when persistence is 0 or fractional, persistence is named', () => {
    expect(fields({ ...good, persistence: 0 })).toEqual(['persistence']);
    expect(fields({ ...good, persistence: 1.5 })).toEqual(['persistence']);
  });

  it('when hysteresis is 0 or above 1, hysteresis is named', () => {
    expect(fields({ ...good, hysteresis: 0 })).toEqual(['hysteresis']);
    expect(fields({ ...good, hysteresis: 1.1 })).toEqual(['hysteresis']);
    expect(fields({ ...good, hysteresis: 1 })).toEqual([]);
  });

  it('when a range is reversed, its upper edge is named', () => {
    expect(fields({ ...good, kind: 'hz', fromHz: 100, toHz: 10 } as BandDefinition)).toEqual([
      'toHz',
    ]);
    expect(fields({ ...good, kind: 'order', fromOrder: 2, toOrder: 2 } as BandDefinition)).toEqual([
      'toOrder',
    ]);
  });

  it('when a fault window has no width, the half-width is named', () => {
    expect(fields({ ...good, halfWidth: 0 })).toEqual(['halfWidth']);
  });

  it('when a statistical rule is malformed, its fields are named', () => {
    expect(
      fields({
        ...good,
        statistical: { kAlert: 0, kDanger: -1, baseline: { from: 'first-n', count: 1 } },
      }),
    ).toEqual(['statistical.kAlert', 'statistical.kDanger', 'statistical.baseline.count']);
    expect(
      fields({
        ...good,
        statistical: { kAlert: 3, baseline: { from: 'period', fromAt: 5, toAt: 5 } },
      }),
    ).toEqual(['statistical.baseline.toAt']);
  });
});
