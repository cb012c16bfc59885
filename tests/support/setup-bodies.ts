/** Request bodies and queries the set-up API tests share. */

/** A medium pump on a rigid foundation (ISO 20816-3 group 2); bearing 6309 from memory. */
export const machineBody = (areaId: number, name: string) => ({
  areaId,
  name,
  type: 'pump',
  nominalRpm: 2960,
  isoGroup: 2,
  foundation: 'rigid',
  criticality: 'high',
  powerKw: 75,
  bladeCount: null,
  vaneCount: 6,
  bearings: [
    {
      name: 'Pump DE',
      designation: '6309',
      rollingElements: 8,
      ballDiameterMm: 17.46,
      pitchDiameterMm: 72.5,
      contactAngleDeg: 0,
      speedRatio: 1,
    },
  ],
  gears: [],
});
export const pointBody = (machineId: number, tag: string, bearingId: number | null = null) => ({
  machineId,
  tag,
  name: 'Pump DE, horizontal',
  location: 'Pump DE',
  direction: 'H',
  sensitivityMvPerG: 100,
  bearingId,
  fmaxHz: 1000,
  lines: 1600,
});

/** Points with their site, through machine and area (the tag's site as the user sees it). */
export const POINTS_OF_SITE = `SELECT p.id, p.tag, p.machine_id FROM points p
  JOIN machines m ON m.id = p.machine_id JOIN areas a ON a.id = m.area_id WHERE a.site_id = ?`;
