import {
  areaInputSchema,
  areaUpdateSchema,
  machineInputSchema,
  pointInputSchema,
  setupTreeSchema,
  siteInputSchema,
  savedAreaSchema,
  savedIdSchema,
  savedSiteSchema,
} from '@turnstone/contracts/setup';
import type { AppContext } from '../../lib/context.ts';
import { serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './setup-service.ts';
import * as points from './setup-points-service.ts';
import { idParam } from '../../lib/route-params.ts';

const ADMIN = ['admin'] as const;
const BUILDERS = ['admin', 'engineer'] as const;

export function setupRoutes(ctx: AppContext): RouteSpec[] {
  const db = ctx.db;
  return [
    serviceRoute({
      method: 'get',
      path: '/setup',
      access: BUILDERS,
      summary: 'plant setup tree with components',
      schemas: { response: setupTreeSchema },
      run: ({ user }) => service.setupTree(db, user),
    }),
    serviceRoute({
      method: 'post',
      path: '/sites',
      access: ADMIN,
      summary: 'create a site',
      schemas: { body: siteInputSchema, response: savedSiteSchema, status: 201 },
      run: async ({ user, body }) =>
        savedSiteSchema.parse(await service.createSite(db, user, body)),
    }),
    serviceRoute({
      method: 'patch',
      path: '/sites/:id',
      access: ADMIN,
      summary: 'update a site',
      schemas: { params: idParam, body: siteInputSchema, response: savedSiteSchema },
      run: async ({ user, params, body }) =>
        savedSiteSchema.parse(await service.updateSite(db, user, params.id, body)),
    }),
    serviceRoute({
      method: 'post',
      path: '/areas',
      access: ADMIN,
      summary: 'create an area',
      schemas: { body: areaInputSchema, response: savedAreaSchema, status: 201 },
      run: async ({ user, body }) =>
        savedAreaSchema.parse(await service.createArea(db, user, body)),
    }),
    serviceRoute({
      method: 'patch',
      path: '/areas/:id',
      access: ADMIN,
      summary: 'rename an area',
      schemas: { params: idParam, body: areaUpdateSchema, response: savedAreaSchema },
      run: async ({ user, params, body }) =>
        savedAreaSchema.parse(await service.updateArea(db, user, params.id, body)),
    }),
    serviceRoute({
      method: 'post',
      path: '/machines',
      access: BUILDERS,
      summary: 'create a machine with its components',
      schemas: { body: machineInputSchema, response: savedIdSchema, status: 201 },
      run: async ({ user, body }) =>
        savedIdSchema.parse(await service.createMachine(db, user, body)),
    }),
    serviceRoute({
      method: 'patch',
      path: '/machines/:id',
      access: BUILDERS,
      summary: 'update a machine and replace its components',
      schemas: { params: idParam, body: machineInputSchema, response: savedIdSchema },
      run: async ({ user, params, body }) =>
        savedIdSchema.parse(await service.updateMachine(db, user, params.id, body)),
    }),
    serviceRoute({
      method: 'delete',
      path: '/machines/:id',
      access: BUILDERS,
      summary: 'delete a machine without data',
      schemas: { params: idParam, status: 204 },
      run: ({ user, params }) => service.deleteMachine(db, user, params.id),
    }),
    serviceRoute({
      method: 'post',
      path: '/points',
      access: BUILDERS,
      summary: 'create a measurement point',
      schemas: { body: pointInputSchema, response: savedIdSchema, status: 201 },
      run: async ({ user, body }) => savedIdSchema.parse(await points.createPoint(db, user, body)),
    }),
    serviceRoute({
      method: 'patch',
      path: '/points/:id',
      access: BUILDERS,
      summary: 'update a measurement point',
      schemas: { params: idParam, body: pointInputSchema, response: savedIdSchema },
      run: async ({ user, params, body }) =>
        savedIdSchema.parse(await points.updatePoint(db, user, params.id, body)),
    }),
    serviceRoute({
      method: 'delete',
      path: '/points/:id',
      access: BUILDERS,
      summary: 'delete a point without data',
      schemas: { params: idParam, status: 204 },
      run: ({ user, params }) => points.deletePoint(db, user, params.id),
    }),
  ];
}
