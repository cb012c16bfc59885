import type { FleetMachine, FleetPoint } from '@turnstone/contracts/fleet';

/** A machine's type as shown to people (fleet tree, machine data, setup form). */
export const machineTypeLabels: Record<FleetMachine['type'], string> = {
  motor: 'Motor',
  pump: 'Pump',
  fan: 'Fan',
  blower: 'Blower',
  gearbox: 'Gearbox',
  compressor: 'Compressor',
};

/** A measurement point's direction (H, V, A) in words. */
export const directionLabels: Record<FleetPoint['direction'], string> = {
  H: 'Horizontal',
  V: 'Vertical',
  A: 'Axial',
};
