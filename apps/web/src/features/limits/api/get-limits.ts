import {
  isoDefaultsResponseSchema,
  limitTemplateResponseSchema,
  suggestResponseSchema,
} from '@turnstone/contracts/limits';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export function getIsoDefaults(pointId: number) {
  return api.get(`/api/v1/points/${pointId}/limits/iso-defaults`, {
    schema: isoDefaultsResponseSchema,
  });
}

export function getSuggestion(pointId: number, band: string) {
  const qs = new URLSearchParams({ band });
  return api.get(`/api/v1/points/${pointId}/limits/suggest?${qs}`, {
    schema: suggestResponseSchema,
  });
}

export function getLimitTemplateQueryOptions(machineType: string) {
  return queryOptions({
    queryKey: ['limit-templates', 'detail', { machineType }] as const,
    queryFn: ({ signal }) =>
      api.get(`/api/v1/limit-templates/${machineType}`, {
        schema: limitTemplateResponseSchema,
        signal,
      }),
  });
}

export function useLimitTemplate(machineType: string | null) {
  return useQuery({
    ...getLimitTemplateQueryOptions(machineType ?? 'pump'),
    enabled: machineType !== null,
  });
}
