import { formatNumber } from '@turnstone/contracts/number-format';
import type { Units } from '../../account/api/use-units.ts';

/**
 * The velocity range of an ISO 20816-3 zone given the machine class's boundaries (from the
 * server, which reads them from packages/condition, in mm/s): A below A/B, B from A/B to B/C,
 * C from B/C to C/D, D from C/D up; a value on a boundary belongs to the higher zone. The
 * range is written in the reader's unit system (in/s for imperial) by the one number rule.
 */
export interface ZoneBoundaries {
  ab: number;
  bc: number;
  cd: number;
}

export function isoZoneRange(
  zone: 'A' | 'B' | 'C' | 'D',
  b: ZoneBoundaries,
  units: Pick<Units, 'value' | 'unit'>,
): string {
  const n = (v: number) => formatNumber(units.value(v, 'mm/s'));
  const u = units.unit('mm/s');
  switch (zone) {
    case 'A':
      return `< ${n(b.ab)} ${u}`;
    case 'B':
      return `${n(b.ab)}–${n(b.bc)} ${u}`;
    case 'C':
      return `${n(b.bc)}–${n(b.cd)} ${u}`;
    case 'D':
      return `≥ ${n(b.cd)} ${u}`;
  }
}
