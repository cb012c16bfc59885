/**
 * The demo scenario: two fictional sites of our own invention. Names, tags and histories
 * are made up; bearing geometry is typical of the catalogue sizes named (demo only).
 */

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
  type: 'motor' | 'pump' | 'fan' | 'blower' | 'gearbox' | 'compressor';
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

const b6316: DemoBearing = {
  name: 'Motor DE',
  designation: '6316',
  rollingElements: 8,
  ballDiameterMm: 28.58,
  pitchDiameterMm: 125,
  contactAngleDeg: 0,
};
const b6314: DemoBearing = {
  name: 'Motor NDE',
  designation: '6314',
  rollingElements: 8,
  ballDiameterMm: 25.4,
  pitchDiameterMm: 110,
  contactAngleDeg: 0,
};
const b6310: DemoBearing = {
  name: 'Motor DE',
  designation: '6310',
  rollingElements: 8,
  ballDiameterMm: 19.05,
  pitchDiameterMm: 80,
  contactAngleDeg: 0,
};
const b6308: DemoBearing = {
  name: 'Motor NDE',
  designation: '6308',
  rollingElements: 8,
  ballDiameterMm: 15.08,
  pitchDiameterMm: 65,
  contactAngleDeg: 0,
};
const b7313: DemoBearing = {
  name: 'Pump DE',
  designation: '7313 BEP',
  rollingElements: 14,
  ballDiameterMm: 23.81,
  pitchDiameterMm: 102.5,
  contactAngleDeg: 40,
};
const b22220: DemoBearing = {
  name: 'Fan DE',
  designation: '22220 E',
  rollingElements: 19,
  ballDiameterMm: 23.5,
  pitchDiameterMm: 141,
  contactAngleDeg: 9.5,
};

const motorPoints = (de: string, nde: string): DemoPoint[] => [
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

const pump = (
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

export const demoPlant: DemoSite[] = [
  {
    code: 'MFP',
    name: 'Marlow Fen Pumping Station',
    timeZone: 'Europe/London',
    areas: [
      {
        name: 'Raw water intake',
        machines: [
          pump('P101', 'Intake pump P-101', 1480, 160, 2, 'outer-race-growing'),
          pump('P102', 'Intake pump P-102', 1480, 160, 2, 'healthy'),
        ],
      },
      {
        name: 'High-lift pumps',
        machines: [
          pump('P201', 'High-lift pump P-201', 1490, 355, 1, 'unbalance-rising'),
          pump('P202', 'High-lift pump P-202', 1490, 355, 1, 'clipped-sensor'),
        ],
      },
      {
        name: 'Aeration',
        machines: [
          {
            code: 'B301',
            name: 'Aeration blower B-301',
            type: 'blower',
            nominalRpm: 2965,
            isoGroup: 2,
            foundation: 'flexible',
            criticality: 'medium',
            powerKw: 90,
            lineHz: 50, // two-pole motor, direct on line
            bladeCount: 3,
            bearings: [b6310, b6308],
            points: motorPoints('Motor DE', 'Motor NDE'),
            story: 'misalignment',
          },
          {
            code: 'B302',
            name: 'Aeration blower B-302',
            type: 'blower',
            nominalRpm: 2965,
            isoGroup: 2,
            foundation: 'flexible',
            criticality: 'medium',
            powerKw: 90,
            lineHz: 50, // two-pole motor, direct on line
            bladeCount: 3,
            bearings: [b6310, b6308],
            points: motorPoints('Motor DE', 'Motor NDE'),
            story: 'under-ranged',
          },
          {
            code: 'G401',
            name: 'Sludge mixer gearbox G-401',
            type: 'gearbox',
            nominalRpm: 1470,
            isoGroup: 2,
            foundation: 'rigid',
            criticality: 'medium',
            powerKw: 30,
            lineHz: null, // the gearbox alone: its motor is not part of this record
            bearings: [
              { ...b6310, name: 'Input shaft' },
              { ...b6308, name: 'Output shaft', speedRatio: 23 / 79 },
            ],
            gears: [{ name: 'Input pinion / wheel', teeth: 23, mateTeeth: 79, speedRatio: 1 }],
            points: [
              {
                suffix: 'GIN-H',
                name: 'Gearbox input, horizontal',
                location: 'Input shaft',
                direction: 'H',
                sensitivityMvPerG: 100,
                bearing: 'Input shaft',
              },
              {
                suffix: 'GOUT-H',
                name: 'Gearbox output, horizontal',
                location: 'Output shaft',
                direction: 'H',
                sensitivityMvPerG: 100,
                bearing: 'Output shaft',
              },
            ],
            story: 'gear-wear',
          },
        ],
      },
    ],
  },
  {
    code: 'TRB',
    name: 'Tessel Ridge Board Mill',
    timeZone: 'Europe/Berlin',
    areas: [
      {
        name: 'Stock preparation',
        machines: [
          {
            code: 'M110',
            name: 'Refiner motor M-110',
            type: 'motor',
            nominalRpm: 993,
            isoGroup: 1,
            foundation: 'rigid',
            criticality: 'high',
            powerKw: 1200,
            lineHz: 50, // six-pole refiner motor on the mill's 50 Hz supply
            bearings: [b6316, b6314],
            points: motorPoints('Motor DE', 'Motor NDE'),
            story: 'inner-race-early',
          },
          pump('P120', 'Stock pump P-120', 1485, 110, 2, 'healthy'),
        ],
      },
      {
        name: 'Dryer section',
        machines: [
          {
            code: 'F210',
            name: 'Dryer hood fan F-210',
            type: 'fan',
            nominalRpm: 740,
            isoGroup: 2,
            foundation: 'flexible',
            criticality: 'medium',
            powerKw: 75,
            lineHz: 50, // eight-pole motor, direct on line
            bladeCount: 10,
            bearings: [b22220, { ...b22220, name: 'Fan NDE' }],
            points: [
              {
                suffix: 'FDE-H',
                name: 'Fan drive end, horizontal',
                location: 'Fan DE',
                direction: 'H',
                sensitivityMvPerG: 100,
                bearing: 'Fan DE',
              },
              {
                suffix: 'FDE-V',
                name: 'Fan drive end, vertical',
                location: 'Fan DE',
                direction: 'V',
                sensitivityMvPerG: 100,
                bearing: 'Fan DE',
              },
              {
                suffix: 'FNDE-H',
                name: 'Fan non-drive end, horizontal',
                location: 'Fan NDE',
                direction: 'H',
                sensitivityMvPerG: 100,
                bearing: 'Fan NDE',
              },
            ],
            story: 'unbalance-rising',
          },
          {
            code: 'G230',
            name: 'Dryer drive gearbox G-230',
            type: 'gearbox',
            nominalRpm: 1480,
            isoGroup: 2,
            foundation: 'rigid',
            criticality: 'high',
            powerKw: 200,
            lineHz: null, // the gearbox alone: its motor is not part of this record
            bearings: [
              { ...b6316, name: 'Input shaft' },
              { ...b6314, name: 'Output shaft', speedRatio: 28 / 97 },
            ],
            gears: [{ name: 'Input pinion / wheel', teeth: 28, mateTeeth: 97, speedRatio: 1 }],
            points: [
              {
                suffix: 'GIN-H',
                name: 'Gearbox input, horizontal',
                location: 'Input shaft',
                direction: 'H',
                sensitivityMvPerG: 100,
                bearing: 'Input shaft',
              },
              {
                suffix: 'GIN-A',
                name: 'Gearbox input, axial',
                location: 'Input shaft',
                direction: 'A',
                sensitivityMvPerG: 100,
                bearing: 'Input shaft',
              },
            ],
            story: 'healthy',
          },
          {
            code: 'F330',
            name: 'Cooling tower fan F-330',
            type: 'fan',
            nominalRpm: 440,
            isoGroup: 2,
            foundation: 'flexible',
            criticality: 'low',
            powerKw: 22,
            lineHz: null, // on an inverter: its supply frequency follows the fan speed
            bladeCount: 6,
            bearings: [b22220],
            points: [
              {
                suffix: 'FDE-H',
                name: 'Fan drive end, horizontal',
                location: 'Fan DE',
                direction: 'H',
                sensitivityMvPerG: 500,
                bearing: 'Fan DE',
              },
            ],
            story: 'aliasing-setup',
          },
        ],
      },
      {
        name: 'Compressor house',
        machines: [
          {
            code: 'C310',
            name: 'Screw compressor C-310',
            type: 'compressor',
            nominalRpm: 2960,
            isoGroup: 2,
            foundation: 'rigid',
            criticality: 'high',
            powerKw: 132,
            lineHz: 50, // two-pole motor, direct on line
            bearings: [b6310, b6308],
            points: motorPoints('Motor DE', 'Motor NDE'),
            story: 'healthy',
          },
          {
            code: 'C320',
            name: 'Screw compressor C-320',
            type: 'compressor',
            nominalRpm: 2960,
            isoGroup: 2,
            foundation: 'rigid',
            criticality: 'high',
            powerKw: 132,
            lineHz: 50, // two-pole motor, direct on line
            bearings: [b6310, b6308],
            points: motorPoints('Motor DE', 'Motor NDE'),
            story: 'healthy',
          },
        ],
      },
    ],
  },
];

/** One demo user per role. The operator works only at the pumping station. */
export const demoUsers = [
  { email: 'admin@turnstone.local', name: 'Ada Admin', role: 'admin', sites: ['MFP', 'TRB'] },
  {
    email: 'engineer@turnstone.local',
    name: 'Erin Engineer',
    role: 'engineer',
    sites: ['MFP', 'TRB'],
  },
  { email: 'planner@turnstone.local', name: 'Pat Planner', role: 'planner', sites: ['MFP', 'TRB'] },
  { email: 'operator@turnstone.local', name: 'Oli Operator', role: 'operator', sites: ['MFP'] },
] as const;
