import {
  analysesQuerySchema,
  analysisListSchema,
  machineDetailSchema,
  pointDetailSchema,
  spectrumQuerySchema,
  spectrumSchema,
  waveformSchema,
} from '@turnstone/contracts/points';
import { pinInputSchema, pinSchema } from '@turnstone/contracts/pins';
import { waterfallQuerySchema, waterfallSchema } from '@turnstone/contracts/waterfall';
import { trendQuerySchema, trendResponseSchema } from '@turnstone/contracts/trend';
import { snapshotStatusSchema } from '@turnstone/contracts/uploads';
import type { AppContext } from '../../lib/context.ts';
import {
  ALL_ROLES,
  fileRoute,
  requireUser,
  serviceRoute,
  type RouteSchemas,
  type RouteSpec,
  type ServiceRouteSpec,
} from '../../lib/route-table.ts';
import * as service from './points-service.ts';
import * as spectra from './spectra-service.ts';
import * as pins from './pins-service.ts';
import * as trends from './trend-service.ts';
import * as waveforms from './waveform-service.ts';
import { idParam } from '../../lib/route-params.ts';

/**
 * The point pages' reads: a GET of one machine, point, snapshot or analysis by `:id`, open
 * to every role (its service answers only for the caller's sites).
 */
function pointRead<const S extends RouteSchemas>(
  route: Omit<ServiceRouteSpec<S>, 'method' | 'access'>,
): RouteSpec {
  return serviceRoute<S>({ ...route, method: 'get', access: ALL_ROLES });
}

/** Who may pin a capture so retention keeps it whole (not operators). */
const PINNERS = ['admin', 'engineer', 'planner'] as const;

export function pointRoutes(ctx: AppContext): RouteSpec[] {
  return [
    pointRead({
      path: '/machines/:id',
      summary: 'machine data, fault frequencies and its points',
      schemas: { params: idParam, response: machineDetailSchema },
      run: ({ user, params }) => service.machineDetail(ctx.db, user, params.id),
    }),
    pointRead({
      path: '/points/:id',
      summary: 'point detail with its bands',
      schemas: { params: idParam, response: pointDetailSchema },
      run: ({ user, params }) => service.pointDetail(ctx, user, params.id),
    }),
    pointRead({
      path: '/snapshots/:id',
      summary: 'snapshot status and its analysis',
      schemas: { params: idParam, response: snapshotStatusSchema },
      run: ({ user, params }) => service.snapshotStatus(ctx, user, params.id),
    }),
    pointRead({
      path: '/points/:id/analyses',
      summary: 'analyses of a point',
      schemas: {
        params: idParam,
        query: analysesQuerySchema,
        response: analysisListSchema,
      },
      run: ({ user, params, query }) => service.listAnalyses(ctx, user, params.id, query),
    }),
    pointRead({
      path: '/points/:id/trend',
      summary: 'band trend with levels and projection',
      schemas: {
        params: idParam,
        query: trendQuerySchema,
        response: trendResponseSchema,
      },
      headers: { 'Cache-Control': 'private, no-cache' },
      run: ({ user, params, query }) => trends.trend(ctx, user, params.id, query),
    }),
    fileRoute({
      method: 'get',
      path: '/points/:id/trend.csv',
      access: ALL_ROLES,
      summary: 'band trend as CSV',
      schemas: {
        params: idParam,
        query: trendQuerySchema,
        produces: 'text/csv',
      },
      contentType: 'text/csv; charset=utf-8',
      run: ({ user, params, query }) => trends.trendCsv(ctx, user, params.id, query),
    }),
    pointRead({
      path: '/points/:id/waterfall',
      summary: 'last spectra of a point',
      schemas: {
        params: idParam,
        query: waterfallQuerySchema,
        response: waterfallSchema,
      },
      run: ({ user, params, query }) =>
        spectra.waterfall(ctx, user, params.id, query.kind, query.limit),
    }),
    {
      method: 'put',
      path: '/analyses/:id/pin',
      access: PINNERS,
      summary: 'pin a capture: retention keeps its spectra and waveform whole',
      schemas: { params: idParam, body: pinInputSchema, response: pinSchema },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        const body = pinInputSchema.parse(req.body ?? {});
        res.json(await pins.pinCapture(ctx, requireUser(req), id, body));
      },
    },
    serviceRoute({
      method: 'delete',
      path: '/analyses/:id/pin',
      access: PINNERS,
      summary: 'unpin a capture (retention treats it like any other again)',
      schemas: { params: idParam, status: 204 },
      run: ({ user, params }) => pins.unpinCapture(ctx, user, params.id),
    }),
    pointRead({
      path: '/analyses/:id/spectrum',
      summary: 'stored spectrum of an analysis',
      schemas: {
        params: idParam,
        query: spectrumQuerySchema,
        response: spectrumSchema,
      },
      // Stored spectra never change once written.
      headers: { 'Cache-Control': 'private, max-age=3600' },
      run: ({ user, params, query }) => spectra.spectrum(ctx, user, params.id, query.kind),
    }),
    pointRead({
      path: '/analyses/:id/waveform',
      summary: 'time waveform of an analysis',
      schemas: { params: idParam, response: waveformSchema },
      run: ({ user, params }) => waveforms.waveform(ctx, user, params.id),
    }),
    fileRoute({
      method: 'get',
      path: '/analyses/:id/waveform.wav',
      access: ALL_ROLES,
      summary: 'raw capture as WAV',
      schemas: { params: idParam, produces: 'audio/wav' },
      contentType: 'audio/wav',
      run: ({ user, params }) => waveforms.waveformWav(ctx, user, params.id),
    }),
    fileRoute({
      method: 'get',
      path: '/analyses/:id/waveform.csv',
      access: ALL_ROLES,
      summary: 'capture as CSV in g',
      schemas: { params: idParam, produces: 'text/csv' },
      contentType: 'text/csv; charset=utf-8',
      run: ({ user, params }) => waveforms.waveformCsv(ctx, user, params.id),
    }),
  ];
}
