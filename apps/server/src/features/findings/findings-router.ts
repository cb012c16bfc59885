import {
  createFindingSchema,
  findingListQuerySchema,
  findingPageSchema,
  findingSchema,
  updateFindingSchema,
} from '@turnstone/contracts/findings';
import type { AppContext } from '../../lib/context.ts';
import { ALL_ROLES, requireUser, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './findings-service.ts';
import { idParam } from '../../lib/route-params.ts';
import { parseQuery } from '../../lib/query.ts';

/** Planners own findings; engineers raise them too (DESIGN.md roles). */
const WRITERS = ['planner', 'engineer'] as const;

export function findingRoutes(ctx: AppContext): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/findings',
      // Every role reads them (the point view marks findings on the trend), per site.
      access: ALL_ROLES,
      summary: 'list findings',
      schemas: { query: findingListQuerySchema, response: findingPageSchema },
      handler: async (req, res) =>
        res.json(
          await service.listFindings(
            ctx,
            requireUser(req),
            parseQuery(findingListQuerySchema, req.query),
          ),
        ),
    },
    {
      method: 'post',
      path: '/findings',
      access: WRITERS,
      summary: 'create a finding',
      schemas: { body: createFindingSchema, response: findingSchema, status: 201 },
      handler: async (req, res) =>
        res
          .status(201)
          .json(
            await service.createFinding(ctx, requireUser(req), createFindingSchema.parse(req.body)),
          ),
    },
    {
      method: 'patch',
      path: '/findings/:id',
      access: WRITERS,
      summary: 'update a finding (state, work order, due date, note)',
      schemas: { params: idParam, body: updateFindingSchema, response: findingSchema },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        res.json(
          await service.updateFinding(
            ctx,
            requireUser(req),
            id,
            updateFindingSchema.parse(req.body),
          ),
        );
      },
    },
  ];
}
