/**
 * Band definitions the condition tests share: the two overall bands with the levels a test
 * chooses (each test says where its levels come from).
 */
import type { BandDefinition } from './band-definition.ts';

/** Overall velocity RMS (mm/s) with these alert and danger levels. */
export const overallVelocity = (alertLevel: number, dangerLevel: number): BandDefinition => ({
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
export const overallAcceleration = (alertLevel: number, dangerLevel: number): BandDefinition => ({
  key: 'overall-acceleration',
  name: 'Overall acceleration',
  kind: 'overall',
  spectrum: 'acceleration',
  measure: 'rms',
  unit: 'g',
  alertLevel,
  dangerLevel,
});
