import type { MachineComponents } from '@turnstone/dsp';
import type { bearings, gears, machines } from '@turnstone/db/schema';

type MachineRow = typeof machines.$inferSelect;

/**
 * Bearings, gears and blades (or vanes) of a machine: what makes its fault frequencies, for
 * the analysis (bands at fault frequencies), the diagnosis and the machine page alike.
 */
export function machineComponentsOf(
  machine: Pick<MachineRow, 'bladeCount' | 'vaneCount'>,
  parts: { bearings: (typeof bearings.$inferSelect)[]; gears: (typeof gears.$inferSelect)[] },
): MachineComponents {
  // A count of 0 means none (a form left at 0), as null does.
  const blades = machine.bladeCount || machine.vaneCount || undefined;
  return {
    bearings: parts.bearings.map((b) => ({
      name: b.name,
      rollingElements: b.rollingElements,
      ballDiameterMm: b.ballDiameterMm,
      pitchDiameterMm: b.pitchDiameterMm,
      contactAngleDeg: b.contactAngleDeg,
      speedRatio: b.speedRatio,
    })),
    gears: parts.gears.map((g) => ({ name: g.name, teeth: g.teeth, speedRatio: g.speedRatio })),
    ...(blades ? { blades } : {}),
  };
}
