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
import { accessiblePoint } from '../places/point-access.ts';
import { ALL_ROLES, requireUser, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './limits-service.ts';
import { idParam } from '../../lib/route-params.ts';
import { parseQuery } from '../../lib/query.ts';

const typeParam = z.object({ machineType: machineTypeSchema });
// The contract schema mirrors the condition package's BandDefinition.
const asBands = (b: unknown) => b as LimitBand[];

export function limitRoutes(ctx: AppContext): RouteSpec[] {
  const point = async (req: Parameters<RouteSpec['handler']>[0]) =>
    accessiblePoint(ctx.db, requireUser(req), idParam.parse(req.params).id);
  return [
    {
      method: 'get',
      path: '/points/:id/limits',
      access: ALL_ROLES,
      summary: "a point's limit set",
      schemas: { params: idParam, response: limitSetResponseSchema },
      handler: async (req, res) =>
        res.json(limitSetResponseSchema.parse(await service.getLimitSet(ctx, await point(req)))),
    },
    {
      method: 'put',
      path: '/points/:id/limits',
      access: ['engineer'],
      summary: "save a point's limit set (audited)",
      schemas: {
        params: idParam,
        body: saveLimitSetRequestSchema,
        response: saveLimitSetResponseSchema,
      },
      handler: async (req, res) => {
        const p = await point(req);
        const body = saveLimitSetRequestSchema.parse(req.body);
        const out = await service.saveLimits(
          ctx,
          requireUser(req),
          p,
          asBands(body.bands),
          body.reason,
        );
        res.json(saveLimitSetResponseSchema.parse(out));
      },
    },
    {
      method: 'post',
      path: '/points/:id/limits/replay',
      access: ['engineer'],
      summary: 'replay proposed limits over the stored history',
      schemas: { params: idParam, body: replayRequestSchema, response: replayResponseSchema },
      handler: async (req, res) => {
        const p = await point(req);
        const body = replayRequestSchema.parse(req.body);
        res.json(replayResponseSchema.parse(await service.replay(ctx, p, asBands(body.bands))));
      },
    },
    {
      method: 'get',
      path: '/points/:id/limits/iso-defaults',
      access: ['engineer'],
      summary: 'ISO 20816-3 default levels for the machine',
      schemas: { params: idParam, response: isoDefaultsResponseSchema },
      handler: async (req, res) =>
        res.json(isoDefaultsResponseSchema.parse(service.isoDefaults(await point(req)))),
    },
    {
      method: 'get',
      path: '/points/:id/limits/suggest',
      access: ['engineer'],
      summary: 'levels from the baseline of a band',
      schemas: { params: idParam, query: suggestQuerySchema, response: suggestResponseSchema },
      handler: async (req, res) => {
        const p = await point(req);
        const q = parseQuery(suggestQuerySchema, req.query);
        res.json(suggestResponseSchema.parse(await service.suggest(ctx, p, q)));
      },
    },
    {
      method: 'get',
      path: '/points/:id/limits/history',
      access: ALL_ROLES,
      summary: "audit entries of a point's limits",
      schemas: { params: idParam, response: limitHistoryResponseSchema },
      handler: async (req, res) => {
        const p = await point(req);
        res.json(limitHistoryResponseSchema.parse(await service.history(ctx, p.point.id)));
      },
    },
    {
      method: 'get',
      path: '/limit-templates/:machineType',
      access: ['engineer'],
      summary: 'a machine-type limit template',
      schemas: { params: typeParam, response: limitTemplateResponseSchema },
      handler: async (req, res) => {
        const { machineType } = typeParam.parse(req.params);
        res.json(limitTemplateResponseSchema.parse(await service.getTemplate(ctx, machineType)));
      },
    },
    {
      method: 'put',
      path: '/limit-templates/:machineType',
      access: ['engineer'],
      summary: 'save a machine-type limit template (audited)',
      schemas: {
        params: typeParam,
        body: saveLimitTemplateRequestSchema,
        response: limitTemplateResponseSchema,
      },
      handler: async (req, res) => {
        const { machineType } = typeParam.parse(req.params);
        const body = saveLimitTemplateRequestSchema.parse(req.body);
        const out = await service.saveTemplate(
          ctx,
          requireUser(req),
          machineType,
          asBands(body.bands),
          body.reason,
        );
        res.json(limitTemplateResponseSchema.parse(out));
      },
    },
  ];
}
