import { fleetSchema } from '@turnstone/contracts/fleet';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

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
    queryKey: ['fleet', 'list', {}] as const,
    queryFn: ({ signal }) => api.get('/api/v1/fleet', { schema: fleetSchema, signal }),
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
    staleTime: 60_000,
  });
}

export function useFleetPoints() {
  return useQuery(getFleetPointsQueryOptions());
}
