import { queryOptions, useQuery } from '@tanstack/react-query';
import { getFleetQueryOptions } from '../../fleet/api/get-fleet.ts';

export interface PointChoice {
  id: number;
  tag: string;
  name: string;
  machineName: string;
  siteName: string;
}

/** Every point the user may see, from the fleet tree, for the point picker. */
export function getFleetPointsQueryOptions() {
  return queryOptions({
    ...getFleetQueryOptions(),
    select: (fleet): PointChoice[] =>
      fleet.items.flatMap((site) =>
        site.areas.flatMap((area) =>
          area.machines.flatMap((m) =>
            m.points.map((p) => ({
              id: p.id,
              tag: p.tag,
              name: p.name,
              machineName: m.name,
              siteName: site.name,
            })),
          ),
        ),
      ),
  });
}

export function useFleetPoints() {
  return useQuery(getFleetPointsQueryOptions());
}
