import type { z } from 'zod';
import type { Db } from '@turnstone/db/client';
import type { Role } from '@turnstone/contracts/roles';
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
import type { SessionUser } from '../../lib/session-user.ts';
import { serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './setup-service.ts';
import * as points from './setup-points-service.ts';
import { idParam } from '../../lib/route-params.ts';

const ADMIN = ['admin'] as const;
const BUILDERS = ['admin', 'engineer'] as const;

/** One setup resource: its path, who edits it, its saved answer and its service functions. */
interface SetupResource<C extends z.ZodType, U extends z.ZodType> {
  path: string;
  access: readonly Role[];
  response: z.ZodType;
  create: {
    summary: string;
    body: C;
    run: (db: Db, user: SessionUser, input: z.output<C>) => unknown;
  };
  update: {
    summary: string;
    body: U;
    run: (db: Db, user: SessionUser, id: number, input: z.output<U>) => unknown;
  };
  remove?: { summary: string; run: (db: Db, user: SessionUser, id: number) => Promise<void> };
}

/**
 * The routes of a setup resource, said once for sites, areas, machines and points: created
 * by POST `path` (201), changed by PATCH `path/:id`, and, where it has `remove`, deleted by
 * DELETE `path/:id` (204). Every setup service takes (db, user, id?, input) in that order.
 */
function resourceRoutes<C extends z.ZodType, U extends z.ZodType>(
  db: Db,
  { path, access, response, create, update, remove }: SetupResource<C, U>,
): RouteSpec[] {
  const byId = `${path}/:id`;
  const routes = [
    serviceRoute({
      method: 'post',
      path,
      access,
      summary: create.summary,
      schemas: { body: create.body, response, status: 201 },
      run: (input) => create.run(db, input.user, input.body as z.output<C>),
    }),
    serviceRoute({
      method: 'patch',
      path: byId,
      access,
      summary: update.summary,
      schemas: { params: idParam, body: update.body, response },
      run: (input) => update.run(db, input.user, input.params.id, input.body as z.output<U>),
    }),
  ];
  if (!remove) return routes;
  const deleteRoute = serviceRoute({
    method: 'delete',
    path: byId,
    access,
    summary: remove.summary,
    schemas: { params: idParam, status: 204 },
    run: (input) => remove.run(db, input.user, input.params.id),
  });
  return [...routes, deleteRoute];
}

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
    ...resourceRoutes(db, {
      path: '/sites',
      access: ADMIN,
      response: savedSiteSchema,
      create: { summary: 'create a site', body: siteInputSchema, run: service.createSite },
      update: { summary: 'update a site', body: siteInputSchema, run: service.updateSite },
    }),
    ...resourceRoutes(db, {
      path: '/areas',
      access: ADMIN,
      response: savedAreaSchema,
      create: { summary: 'create an area', body: areaInputSchema, run: service.createArea },
      update: { summary: 'rename an area', body: areaUpdateSchema, run: service.updateArea },
    }),
    ...resourceRoutes(db, {
      path: '/machines',
      access: BUILDERS,
      response: savedIdSchema,
      create: {
        summary: 'create a machine with its components',
        body: machineInputSchema,
        run: service.createMachine,
      },
      update: {
        summary: 'update a machine and replace its components',
        body: machineInputSchema,
        run: service.updateMachine,
      },
      remove: { summary: 'delete a machine without data', run: service.deleteMachine },
    }),
    ...resourceRoutes(db, {
      path: '/points',
      access: BUILDERS,
      response: savedIdSchema,
      create: {
        summary: 'create a measurement point',
        body: pointInputSchema,
        run: points.createPoint,
      },
      update: {
        summary: 'update a measurement point',
        body: pointInputSchema,
        run: points.updatePoint,
      },
      remove: { summary: 'delete a point without data', run: points.deletePoint },
    }),
  ];
}
