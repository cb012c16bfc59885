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
import { requireUser, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './setup-service.ts';
import * as points from './setup-points-service.ts';
import { idParam } from '../../lib/route-params.ts';

const ADMIN = ['admin'] as const;
const BUILDERS = ['admin', 'engineer'] as const;

export function setupRoutes(ctx: AppContext): RouteSpec[] {
  const db = ctx.db;
  return [
    {
      method: 'get',
      path: '/setup',
      access: BUILDERS,
      summary: 'plant setup tree with components',
      schemas: { response: setupTreeSchema },
      handler: async (req, res) => res.json(await service.setupTree(db, requireUser(req))),
    },
    {
      method: 'post',
      path: '/sites',
      access: ADMIN,
      summary: 'create a site',
      schemas: { body: siteInputSchema, response: savedSiteSchema, status: 201 },
      handler: async (req, res) => {
        const body = siteInputSchema.parse(req.body);
        res
          .status(201)
          .json(savedSiteSchema.parse(await service.createSite(db, requireUser(req), body)));
      },
    },
    {
      method: 'patch',
      path: '/sites/:id',
      access: ADMIN,
      summary: 'update a site',
      schemas: { params: idParam, body: siteInputSchema, response: savedSiteSchema },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        const body = siteInputSchema.parse(req.body);
        res.json(savedSiteSchema.parse(await service.updateSite(db, requireUser(req), id, body)));
      },
    },
    {
      method: 'post',
      path: '/areas',
      access: ADMIN,
      summary: 'create an area',
      schemas: { body: areaInputSchema, response: savedAreaSchema, status: 201 },
      handler: async (req, res) => {
        const body = areaInputSchema.parse(req.body);
        res
          .status(201)
          .json(savedAreaSchema.parse(await service.createArea(db, requireUser(req), body)));
      },
    },
    {
      method: 'patch',
      path: '/areas/:id',
      access: ADMIN,
      summary: 'rename an area',
      schemas: { params: idParam, body: areaUpdateSchema, response: savedAreaSchema },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        const body = areaUpdateSchema.parse(req.body);
        res.json(savedAreaSchema.parse(await service.updateArea(db, requireUser(req), id, body)));
      },
    },
    {
      method: 'post',
      path: '/machines',
      access: BUILDERS,
      summary: 'create a machine with its components',
      schemas: { body: machineInputSchema, response: savedIdSchema, status: 201 },
      handler: async (req, res) => {
        const body = machineInputSchema.parse(req.body);
        res
          .status(201)
          .json(savedIdSchema.parse(await service.createMachine(db, requireUser(req), body)));
      },
    },
    {
      method: 'patch',
      path: '/machines/:id',
      access: BUILDERS,
      summary: 'update a machine and replace its components',
      schemas: { params: idParam, body: machineInputSchema, response: savedIdSchema },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        const body = machineInputSchema.parse(req.body);
        res.json(savedIdSchema.parse(await service.updateMachine(db, requireUser(req), id, body)));
      },
    },
    {
      method: 'delete',
      path: '/machines/:id',
      access: BUILDERS,
      summary: 'delete a machine without data',
      schemas: { params: idParam, status: 204 },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        await service.deleteMachine(db, requireUser(req), id);
        res.status(204).end();
      },
    },
    {
      method: 'post',
      path: '/points',
      access: BUILDERS,
      summary: 'create a measurement point',
      schemas: { body: pointInputSchema, response: savedIdSchema, status: 201 },
      handler: async (req, res) => {
        const body = pointInputSchema.parse(req.body);
        res
          .status(201)
          .json(savedIdSchema.parse(await points.createPoint(db, requireUser(req), body)));
      },
    },
    {
      method: 'patch',
      path: '/points/:id',
      access: BUILDERS,
      summary: 'update a measurement point',
      schemas: { params: idParam, body: pointInputSchema, response: savedIdSchema },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        const body = pointInputSchema.parse(req.body);
        res.json(savedIdSchema.parse(await points.updatePoint(db, requireUser(req), id, body)));
      },
    },
    {
      method: 'delete',
      path: '/points/:id',
      access: BUILDERS,
      summary: 'delete a point without data',
      schemas: { params: idParam, status: 204 },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        await points.deletePoint(db, requireUser(req), id);
        res.status(204).end();
      },
    },
  ];
}
