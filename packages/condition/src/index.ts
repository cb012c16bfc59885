/**
 * `@turnstone/condition` — pure condition-assessment rules: ISO 20816-3 zones, limit sets and
 * their evaluation with persistence and hysteresis, statistical baselines, the alert state
 * machine, trend projection and replay of a limit set against history. No I/O.
 */
export * from './quality.ts';
export * from './iso-zones.ts';
export * from './iso-band.ts';
export * from './iso-default-levels.ts';
export * from './band-definition.ts';
export * from './band-description.ts';
export * from './baseline.ts';
export * from './effective-levels.ts';
export * from './band-evaluation.ts';
export * from './alert-machine.ts';
export * from './snapshot-evaluation.ts';
export * from './replay.ts';
export * from './least-squares.ts';
export * from './trend-projection.ts';
export * from './trend-regime.ts';
export * from './machine-templates.ts';
export * from './diagnosis.ts';
export * from './diagnosis-severity.ts';
