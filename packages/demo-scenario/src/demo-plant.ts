/**
 * The demo scenario: two fictional sites of our own invention. Names, tags and histories
 * are made up; bearing geometry is typical of the catalogue sizes named (demo only).
 */
import {
  b6308,
  b6310,
  b6314,
  b6316,
  b22220,
  blower,
  compressor,
  gearbox,
  gearboxPoint,
  motorPoints,
  pump,
  type DemoSite,
} from './demo-parts.ts';

export type * from './demo-parts.ts';

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
          blower('B301', 'Aeration blower B-301', 'misalignment'),
          blower('B302', 'Aeration blower B-302', 'under-ranged'),
          gearbox(
            'G401',
            'Sludge mixer gearbox G-401',
            1470,
            30,
            'medium',
            { input: b6310, output: b6308, pinion: 23, wheel: 79 },
            [gearboxPoint('Input', 'H'), gearboxPoint('Output', 'H')],
            'gear-wear',
          ),
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
          gearbox(
            'G230',
            'Dryer drive gearbox G-230',
            1480,
            200,
            'high',
            { input: b6316, output: b6314, pinion: 28, wheel: 97 },
            [gearboxPoint('Input', 'H'), gearboxPoint('Input', 'A')],
            'healthy',
          ),
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
          compressor('C310', 'Screw compressor C-310', 'healthy'),
          compressor('C320', 'Screw compressor C-320', 'healthy'),
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
