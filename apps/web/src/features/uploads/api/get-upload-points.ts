import type { Fleet } from '@turnstone/contracts/fleet';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { getFleetQueryOptions } from '../../fleet/api/get-fleet.ts';

export interface UploadPoint {
  id: number;
  tag: string;
  label: string;
  group: string;
  /** The point's site's time zone: the upload's "Taken at" is read in it. */
  timeZone: string;
}

/** Every point the user can see, labelled for a chooser: "Site · Area · Machine". */
export function flattenPoints(fleet: Fleet): UploadPoint[] {
  const out: UploadPoint[] = [];
  for (const site of fleet.items)
    for (const area of site.areas)
      for (const machine of area.machines)
        for (const p of machine.points)
          out.push({
            id: p.id,
            tag: p.tag,
            label: `${p.tag} — ${p.name}`,
            group: `${site.code} · ${area.name} · ${machine.name}`,
            timeZone: site.timeZone,
          });
  return out;
}

export function getUploadPointsQueryOptions() {
  return queryOptions({ ...getFleetQueryOptions(), select: flattenPoints });
}

export function useUploadPoints() {
  return useQuery(getUploadPointsQueryOptions());
}
