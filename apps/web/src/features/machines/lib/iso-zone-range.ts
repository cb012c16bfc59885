/**
 * The velocity range of an ISO 20816-3 zone given the machine class's boundaries (from the
 * server, which reads them from packages/condition): A below A/B, B from A/B to B/C, C from
 * B/C to C/D, D from C/D up; a value on a boundary belongs to the higher zone.
 */
export interface ZoneBoundaries {
  ab: number;
  bc: number;
  cd: number;
}

export function isoZoneRange(zone: 'A' | 'B' | 'C' | 'D', b: ZoneBoundaries): string {
  switch (zone) {
    case 'A':
      return `< ${b.ab} mm/s`;
    case 'B':
      return `${b.ab}–${b.bc} mm/s`;
    case 'C':
      return `${b.bc}–${b.cd} mm/s`;
    case 'D':
      return `≥ ${b.cd} mm/s`;
  }
}
