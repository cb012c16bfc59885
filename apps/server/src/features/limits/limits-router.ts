import { z } from 'zod';
import type { BandDefinition as LimitBand } from '@turnstone/condition';
import { machineTypeSchema } from '@turnstone/contracts/fleet';
import {
  isoDefaultsResponseSchema,
  limitHistoryResponseSchema,
  limitSetResponseSchema,
  limitTemplateResponseSchema,
  replayRequestSchema,
  replayResponseSchema,
  saveLimitSetRequestSchema,
  saveLimitSetResponseSchema,
  saveLimitTemplateRequestSchema,
  suggestQuerySchema,
  suggestResponseSchema,
} from '@turnstone/contracts/limits';
import type { AppContext } from '../../lib/context.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { accessiblePoint } from '../places/point-access.ts';
import { ALL_ROLES, serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './limits-service.ts';
import { idParam } from '../../lib/route-params.ts';

const typeParam = z.object({ machineType: machineTypeSchema });
// The contract schema mirrors the condition package's BandDefinition.
const asBands = (b: unknown) => b as LimitBand[];

export function limitRoutes(ctx: AppContext): RouteSpec[] {
  /** The point of `/points/:id/limits…`, if the caller's sites include it. */
  const point = (user: SessionUser, params: { id: number }) =>
    accessiblePoint(ctx.db, user, params.id);
  return [
    serviceRoute({
      method: 'get',
      path: '/points/:id/limits',
      access: ALL_ROLES,
      summary: "a point's limit set",
      schemas: { params: idParam, response: limitSetResponseSchema },
      run: async ({ user, params }) => service.getLimitSet(ctx, await point(user, params)),
    }),
    serviceRoute({
      method: 'put',
      path: '/points/:id/limits',
      access: ['engineer'],
      summary: "save a point's limit set (audited)",
      schemas: {
        params: idParam,
        body: saveLimitSetRequestSchema,
        response: saveLimitSetResponseSchema,
      },
      run: async ({ user, params, body }) =>
        service.saveLimits(ctx, user, await point(user, params), asBands(body.bands), body.reason),
    }),
    serviceRoute({
      method: 'post',
      path: '/points/:id/limits/replay',
      access: ['engineer'],
      summary: 'replay proposed limits over the stored history',
      schemas: { params: idParam, body: replayRequestSchema, response: replayResponseSchema },
      run: async ({ user, params, body }) =>
        service.replay(ctx, await point(user, params), asBands(body.bands)),
    }),
    serviceRoute({
      method: 'get',
      path: '/points/:id/limits/iso-defaults',
      access: ['engineer'],
      summary: 'ISO 20816-3 default levels for the machine',
      schemas: { params: idParam, response: isoDefaultsResponseSchema },
      run: async ({ user, params }) => service.isoDefaults(await point(user, params)),
    }),
    serviceRoute({
      method: 'get',
      path: '/points/:id/limits/suggest',
      access: ['engineer'],
      summary: 'levels from the baseline of a band',
      schemas: { params: idParam, query: suggestQuerySchema, response: suggestResponseSchema },
      run: async ({ user, params, query }) =>
        service.suggest(ctx, await point(user, params), query),
    }),
    serviceRoute({
      method: 'get',
      path: '/points/:id/limits/history',
      access: ALL_ROLES,
      summary: "audit entries of a point's limits",
      schemas: { params: idParam, response: limitHistoryResponseSchema },
      run: async ({ user, params }) => service.history(ctx, (await point(user, params)).point.id),
    }),
    serviceRoute({
      method: 'get',
      path: '/limit-templates/:machineType',
      access: ['engineer'],
      summary: 'a machine-type limit template',
      schemas: { params: typeParam, response: limitTemplateResponseSchema },
      run: ({ params }) => service.getTemplate(ctx, params.machineType),
    }),
    serviceRoute({
      method: 'put',
      path: '/limit-templates/:machineType',
      access: ['engineer'],
      summary: 'save a machine-type limit template (audited)',
      schemas: {
        params: typeParam,
        body: saveLimitTemplateRequestSchema,
        response: limitTemplateResponseSchema,
      },
      run: ({ user, params, body }) =>
        service.saveTemplate(ctx, user, params.machineType, asBands(body.bands), body.reason),
    }),
  ];
}
