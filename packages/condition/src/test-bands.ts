/**
 * Band definitions the condition tests (and the limits editor's) share: two overall bands and
 * a bearing fault window, with the levels a test chooses (each test says where its levels
 * come from).
 */
import type { BandDefinition } from './band-definition.ts';

type Of<K extends BandDefinition['kind']> = Extract<BandDefinition, { kind: K }>;

/** Overall velocity RMS (mm/s) with these alert and danger levels. */
export const overallVelocity = (alertLevel: number, dangerLevel: number): Of<'overall'> => ({
  key: 'overall-velocity',
  name: 'Overall velocity',
  kind: 'overall',
  spectrum: 'velocity',
  measure: 'rms',
  unit: 'mm/s',
  alertLevel,
  dangerLevel,
});

/** Overall acceleration RMS (g) with these alert and danger levels. */
export const overallAcceleration = (alertLevel: number, dangerLevel: number): Of<'overall'> => ({
  key: 'overall-acceleration',
  name: 'Overall acceleration',
  kind: 'overall',
  spectrum: 'acceleration',
  measure: 'rms',
  unit: 'g',
  alertLevel,
  dangerLevel,
});

/** An envelope window (peak, g) of ±2 % around the bearing's outer-race frequency (BPFO). */
export const bpfoEnvelope = (alertLevel: number, dangerLevel: number): Of<'fault'> => ({
  key: 'bpfo',
  name: 'Bearing outer race',
  kind: 'fault',
  fault: 'bpfo',
  halfWidth: 2,
  halfWidthUnit: 'percent',
  spectrum: 'envelope',
  measure: 'peak',
  unit: 'g',
  alertLevel,
  dangerLevel,
});
