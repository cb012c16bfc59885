import type { FleetMachine, FleetPoint } from '@turnstone/contracts/fleet';

export const machineTypeLabels: Record<FleetMachine['type'], string> = {
  motor: 'Motor',
  pump: 'Pump',
  fan: 'Fan',
  blower: 'Blower',
  gearbox: 'Gearbox',
  compressor: 'Compressor',
};

export const directionLabels: Record<FleetPoint['direction'], string> = {
  H: 'Horizontal',
  V: 'Vertical',
  A: 'Axial',
};
