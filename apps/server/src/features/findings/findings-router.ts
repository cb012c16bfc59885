import {
  createFindingSchema,
  findingListQuerySchema,
  findingPageSchema,
  findingSchema,
  updateFindingSchema,
} from '@turnstone/contracts/findings';
import type { AppContext } from '../../lib/context.ts';
import { ALL_ROLES, serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './findings-service.ts';
import { idParam } from '../../lib/route-params.ts';

/** Planners own findings; engineers raise them too (DESIGN.md roles). */
const WRITERS = ['planner', 'engineer'] as const;

export function findingRoutes(ctx: AppContext): RouteSpec[] {
  return [
    serviceRoute({
      method: 'get',
      path: '/findings',
      // Every role reads them (the point view marks findings on the trend), per site.
      access: ALL_ROLES,
      summary: 'list findings',
      schemas: { query: findingListQuerySchema, response: findingPageSchema },
      run: ({ user, query }) => service.listFindings(ctx, user, query),
    }),
    serviceRoute({
      method: 'post',
      path: '/findings',
      access: WRITERS,
      summary: 'create a finding',
      schemas: { body: createFindingSchema, response: findingSchema, status: 201 },
      run: ({ user, body }) => service.createFinding(ctx, user, body),
    }),
    serviceRoute({
      method: 'patch',
      path: '/findings/:id',
      access: WRITERS,
      summary: 'update a finding (state, work order, due date, note)',
      schemas: { params: idParam, body: updateFindingSchema, response: findingSchema },
      run: ({ user, params, body }) => service.updateFinding(ctx, user, params.id, body),
    }),
  ];
}
