/**
 * The demo scenario's shapes and parts: the record of a site, area, machine and point, the
 * catalogue bearings used (geometry typical of the sizes named; demo only) and the point
 * sets and pump shape the plant repeats.
 */

import type { MachineType } from '@turnstone/contracts/fleet';
export interface DemoBearing {
  name: string;
  designation: string;
  rollingElements: number;
  ballDiameterMm: number;
  pitchDiameterMm: number;
  contactAngleDeg: number;
  speedRatio?: number;
}

export interface DemoGear {
  name: string;
  teeth: number;
  mateTeeth: number;
  speedRatio: number;
}

export interface DemoPoint {
  /** Suffix of the tag; the full tag is `<site>-<machine>-<suffix>`. */
  suffix: string;
  name: string;
  location: string;
  direction: 'H' | 'V' | 'A';
  sensitivityMvPerG: number;
  bearing?: string;
}

export interface DemoMachine {
  code: string;
  name: string;
  type: MachineType;
  nominalRpm: number;
  isoGroup: 1 | 2;
  foundation: 'rigid' | 'flexible';
  criticality: 'low' | 'medium' | 'high';
  powerKw: number;
  bladeCount?: number;
  vaneCount?: number;
  /**
   * Supply frequency of the machine's motor, Hz. Both sites are on 50 Hz grids; null where
   * the machine record holds no mains-fed motor (a gearbox measured on its own shafts) or
   * the motor runs on an inverter (the supply at the motor is not the grid's).
   */
  lineHz: 50 | 60 | null;
  bearings: DemoBearing[];
  gears?: DemoGear[];
  points: DemoPoint[];
  /** What the generated history does on this machine (gateway simulator and seed). */
  story:
    | 'healthy'
    | 'outer-race-growing'
    | 'inner-race-early'
    | 'unbalance-rising'
    | 'misalignment'
    | 'gear-wear'
    | 'clipped-sensor'
    | 'under-ranged'
    | 'aliasing-setup';
}

export interface DemoArea {
  name: string;
  machines: DemoMachine[];
}

export interface DemoSite {
  code: string;
  name: string;
  timeZone: string;
  areas: DemoArea[];
}

export const b6316: DemoBearing = {
  name: 'Motor DE',
  designation: '6316',
  rollingElements: 8,
  ballDiameterMm: 28.58,
  pitchDiameterMm: 125,
  contactAngleDeg: 0,
};
export const b6314: DemoBearing = {
  name: 'Motor NDE',
  designation: '6314',
  rollingElements: 8,
  ballDiameterMm: 25.4,
  pitchDiameterMm: 110,
  contactAngleDeg: 0,
};
export const b6310: DemoBearing = {
  name: 'Motor DE',
  designation: '6310',
  rollingElements: 8,
  ballDiameterMm: 19.05,
  pitchDiameterMm: 80,
  contactAngleDeg: 0,
};
export const b6308: DemoBearing = {
  name: 'Motor NDE',
  designation: '6308',
  rollingElements: 8,
  ballDiameterMm: 15.08,
  pitchDiameterMm: 65,
  contactAngleDeg: 0,
};
export const b7313: DemoBearing = {
  name: 'Pump DE',
  designation: '7313 BEP',
  rollingElements: 14,
  ballDiameterMm: 23.81,
  pitchDiameterMm: 102.5,
  contactAngleDeg: 40,
};
export const b22220: DemoBearing = {
  name: 'Fan DE',
  designation: '22220 E',
  rollingElements: 19,
  ballDiameterMm: 23.5,
  pitchDiameterMm: 141,
  contactAngleDeg: 9.5,
};

export const motorPoints = (de: string, nde: string): DemoPoint[] => [
  {
    suffix: 'MDE-H',
    name: 'Motor drive end, horizontal',
    location: 'Motor DE',
    direction: 'H',
    sensitivityMvPerG: 100,
    bearing: de,
  },
  {
    suffix: 'MDE-V',
    name: 'Motor drive end, vertical',
    location: 'Motor DE',
    direction: 'V',
    sensitivityMvPerG: 100,
    bearing: de,
  },
  {
    suffix: 'MNDE-H',
    name: 'Motor non-drive end, horizontal',
    location: 'Motor NDE',
    direction: 'H',
    sensitivityMvPerG: 100,
    bearing: nde,
  },
];

export const pump = (
  code: string,
  name: string,
  rpm: number,
  kw: number,
  group: 1 | 2,
  story: DemoMachine['story'],
): DemoMachine => ({
  code,
  name,
  type: 'pump',
  nominalRpm: rpm,
  isoGroup: group,
  foundation: 'rigid',
  criticality: 'high',
  powerKw: kw,
  vaneCount: 6,
  lineHz: 50, // four-pole motor, direct on line
  bearings: [b6316, b6314, b7313],
  points: [
    ...motorPoints('Motor DE', 'Motor NDE'),
    {
      suffix: 'PDE-A',
      name: 'Pump drive end, axial',
      location: 'Pump DE',
      direction: 'A',
      sensitivityMvPerG: 100,
      bearing: 'Pump DE',
    },
  ],
  story,
});

/** A motor-driven machine measured at its motor's two bearings (6310 DE, 6308 NDE). */
const twoPoleMotorDriven = (
  code: string,
  name: string,
  type: MachineType,
  nominalRpm: number,
  foundation: DemoMachine['foundation'],
  criticality: DemoMachine['criticality'],
  powerKw: number,
  story: DemoMachine['story'],
): DemoMachine => ({
  code,
  name,
  type,
  nominalRpm,
  isoGroup: 2,
  foundation,
  criticality,
  powerKw,
  lineHz: 50, // two-pole motor, direct on line
  bearings: [b6310, b6308],
  points: motorPoints('Motor DE', 'Motor NDE'),
  story,
});

/** A 90 kW aeration blower with three blades on a flexible foundation. */
export const blower = (code: string, name: string, story: DemoMachine['story']): DemoMachine => ({
  ...twoPoleMotorDriven(code, name, 'blower', 2965, 'flexible', 'medium', 90, story),
  bladeCount: 3,
});

/** A 132 kW screw compressor on a rigid foundation. */
export const compressor = (code: string, name: string, story: DemoMachine['story']) =>
  twoPoleMotorDriven(code, name, 'compressor', 2960, 'rigid', 'high', 132, story);

/** A point on a gearbox's input or output shaft bearing. */
export const gearboxPoint = (shaft: 'Input' | 'Output', direction: 'H' | 'A'): DemoPoint => ({
  suffix: `${shaft === 'Input' ? 'GIN' : 'GOUT'}-${direction}`,
  name: `Gearbox ${shaft.toLowerCase()}, ${direction === 'H' ? 'horizontal' : 'axial'}`,
  location: `${shaft} shaft`,
  direction,
  sensitivityMvPerG: 100,
  bearing: `${shaft} shaft`,
});

/**
 * A single-stage gearbox recorded alone (its motor is not part of the record, so no line
 * frequency): the input pinion meshes with the output wheel, whose shaft runs at
 * pinion/wheel of the input speed.
 */
export const gearbox = (
  code: string,
  name: string,
  rpm: number,
  kw: number,
  criticality: DemoMachine['criticality'],
  shafts: { input: DemoBearing; output: DemoBearing; pinion: number; wheel: number },
  points: DemoPoint[],
  story: DemoMachine['story'],
): DemoMachine => ({
  code,
  name,
  type: 'gearbox',
  nominalRpm: rpm,
  isoGroup: 2,
  foundation: 'rigid',
  criticality,
  powerKw: kw,
  lineHz: null,
  bearings: [
    { ...shafts.input, name: 'Input shaft' },
    { ...shafts.output, name: 'Output shaft', speedRatio: shafts.pinion / shafts.wheel },
  ],
  gears: [
    { name: 'Input pinion / wheel', teeth: shafts.pinion, mateTeeth: shafts.wheel, speedRatio: 1 },
  ],
  points,
  story,
});
