import { describe, it, expect } from 'vitest';
import { checkBandDefinition } from './band-definition.ts';
import { limitSetFromTemplate, MACHINE_TYPES, TEMPLATE_DEFAULTS } from './machine-templates.ts';

const keys = (type: (typeof MACHINE_TYPES)[number]) =>
  limitSetFromTemplate({ type, isoGroup: 2, foundation: 'rigid', nominalRpm: 1480 }).bands.map(
    (b) => b.key,
  );

describe('limitSetFromTemplate', () => {
  it('when built for a motor, it holds overall velocity and acceleration, 1×, 2× and bearing bands only', () => {
    expect(keys('motor')).toEqual([
      'overall-velocity',
      'overall-acceleration',
      'order-1x',
      'order-2x',
      'bpfo',
      'bpfi',
      'bsf',
    ]);
  });

  it('when the shaft turns at 300 r/min, displacement governs and an overall displacement band is added', () => {
    // ISO 20816-3 displacement boundaries group 2 rigid B/C 45, C/D 71 µm RMS (from memory)
    const slow = limitSetFromTemplate({
      type: 'fan',
      isoGroup: 2,
      foundation: 'rigid',
      nominalRpm: 300,
    });
    const band = slow.bands.find((b) => b.key === 'overall-displacement');
    expect(band).toMatchObject({
      kind: 'overall',
      spectrum: 'displacement',
      measure: 'rms',
      unit: 'um',
      fromHz: 2,
      toHz: 1000,
      alertLevel: 45,
      dangerLevel: 71,
    });
    expect(band?.levelSource).toMatch(/from memory/);
    expect(checkBandDefinition(band!)).toEqual([]);
    expect(keys('fan')).not.toContain('overall-displacement');
  });

  it('when built, every band raises on 2 values and clears on 3', () => {
    // common practice, no source
    for (const b of limitSetFromTemplate({
      type: 'pump',
      isoGroup: 1,
      foundation: 'flexible',
      nominalRpm: 1480,
    }).bands) {
      expect([b.persistence, b.clearPersistence, b.clearAfterHours]).toEqual([2, 3, 120]);
    }
  });

  it('when built for a gearbox, it adds a gear-mesh band and no blade pass', () => {
    expect(keys('gearbox')).toContain('gear-mesh');
    expect(keys('gearbox')).not.toContain('blade-pass');
  });

  it('when built for a fan or blower, it adds a blade-pass band; for a pump, a vane-pass band', () => {
    expect(keys('fan')).toContain('blade-pass');
    expect(keys('blower')).toContain('blade-pass');
    const pump = limitSetFromTemplate({
      type: 'pump',
      isoGroup: 2,
      foundation: 'rigid',
      nominalRpm: 2950,
    });
    expect(pump.bands.find((b) => b.key === 'blade-pass')?.name).toBe('Vane pass');
    expect(keys('compressor')).not.toContain('blade-pass');
    expect(keys('motor')).not.toContain('gear-mesh');
  });

  it('when the machine has plain bearings, no bearing defect bands are made', () => {
    const set = limitSetFromTemplate({
      type: 'compressor',
      isoGroup: 1,
      foundation: 'rigid',
      nominalRpm: 3600,
      rollingBearings: false,
    });
    expect(set.bands.map((b) => b.key)).not.toContain('bpfo');
  });

  it('when built for group 1 flexible, overall velocity takes the ISO B/C and C/D boundaries', () => {
    // ISO 20816-3 group 1 flexible: 7.1 / 11.0 mm/s, from memory
    const set = limitSetFromTemplate({
      type: 'fan',
      isoGroup: 1,
      foundation: 'flexible',
      nominalRpm: 990,
    });
    const overall = set.bands.find((b) => b.key === 'overall-velocity');
    expect(overall).toMatchObject({
      alertLevel: 7.1,
      dangerLevel: 11.0,
      unit: 'mm/s',
      measure: 'rms',
    });
    expect(overall?.levelSource).toContain('from memory');
  });

  it('when the speed is 500 r/min, overall velocity spans 2–1000 Hz; at 1480 r/min, 10–1000 Hz', () => {
    // ISO 20816-3 band, from memory
    const slow = limitSetFromTemplate({
      type: 'fan',
      isoGroup: 1,
      foundation: 'rigid',
      nominalRpm: 500,
    });
    expect(slow.bands[0]).toMatchObject({ kind: 'overall', fromHz: 2, toHz: 1000 });
    const fast = limitSetFromTemplate({
      type: 'fan',
      isoGroup: 1,
      foundation: 'rigid',
      nominalRpm: 1480,
    });
    expect(fast.bands[0]).toMatchObject({ kind: 'overall', fromHz: 10, toHz: 1000 });
  });

  it('when the speed is outside the ISO scope, the fallback band is used and said so', () => {
    const set = limitSetFromTemplate({
      type: 'fan',
      isoGroup: 2,
      foundation: 'rigid',
      nominalRpm: 60,
    });
    expect(set.bands[0]).toMatchObject({ fromHz: 10, toHz: 1000 });
    expect(set.bands[0]?.levelSource).toContain('outside');
  });

  it('when 1× levels are derived, they are 0.8 × the ISO levels (group 2 rigid: 2.24 / 3.6)', () => {
    // 0.8 × 2.8 and 0.8 × 4.5 (ISO from memory; factor common practice, no source)
    const set = limitSetFromTemplate({
      type: 'motor',
      isoGroup: 2,
      foundation: 'rigid',
      nominalRpm: 1480,
    });
    expect(set.bands.find((b) => b.key === 'order-1x')).toMatchObject({
      alertLevel: 2.24,
      dangerLevel: 3.6,
    });
  });

  it('when the gearbox template is used, overall acceleration levels are doubled', () => {
    const gearbox = limitSetFromTemplate({
      type: 'gearbox',
      isoGroup: 2,
      foundation: 'rigid',
      nominalRpm: 1480,
    });
    expect(gearbox.bands.find((b) => b.key === 'overall-acceleration')).toMatchObject({
      alertLevel: 2 * TEMPLATE_DEFAULTS.overallAcceleration.alertLevel,
    });
  });

  it('when any template is built, every band is valid, keys are unique and persistence is the template default', () => {
    for (const type of MACHINE_TYPES) {
      for (const isoGroup of [1, 2] as const) {
        for (const foundation of ['rigid', 'flexible'] as const) {
          const set = limitSetFromTemplate({ type, isoGroup, foundation, nominalRpm: 1480 });
          expect(set.template).toBe(type);
          for (const band of set.bands) {
            expect(checkBandDefinition(band), `${type} ${band.key}`).toEqual([]);
            expect(band.persistence).toBe(2);
          }
          expect(new Set(set.bands.map((b) => b.key)).size).toBe(set.bands.length);
        }
      }
    }
  });
});
