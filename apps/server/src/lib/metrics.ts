/**
 * Operations metrics in the Prometheus text format (prom-client). Counters and histograms
 * live in one registry per process: every request, post and analysis of this process counts
 * there, whichever app instance served it. Figures that belong to the database rather than
 * to a process (queue depth and age, outbox states) are read when a scrape asks, so every
 * API process answers the same for them whatever worker processes run beside it.
 *
 * Names follow the Prometheus naming guide (https://prometheus.io/docs/practices/naming/):
 * base units (seconds, bytes), `_total` on counters, one `turnstone_` prefix.
 */
import { Counter, Gauge, Histogram, Registry, collectDefaultMetrics } from 'prom-client';
import type { IngestResult } from '@turnstone/contracts/ingest';

export const registry = new Registry();
collectDefaultMetrics({ register: registry });

/** Which part of the server answered: gateways' ingest, the dashboard API, or the web app. */
export type RequestArea = 'ingest' | 'api' | 'web';

export function requestArea(path: string): RequestArea {
  if (path.startsWith('/api/ingest/')) return 'ingest';
  if (path.startsWith('/api/') || path === '/metrics') return 'api';
  return 'web';
}

const httpRequests = new Counter({
  name: 'turnstone_http_requests_total',
  help: 'HTTP requests answered, by area of the server and status class.',
  labelNames: ['area', 'status_class'] as const,
  registers: [registry],
});

const httpDuration = new Histogram({
  name: 'turnstone_http_request_duration_seconds',
  help: 'Time from request to the last byte of the answer, by area of the server.',
  labelNames: ['area'] as const,
  buckets: [0.002, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 10],
  registers: [registry],
});

/** Counts one answered request (called by the request log, once per request). */
export function observeRequest(path: string, status: number, seconds: number): void {
  const area = requestArea(path);
  httpRequests.inc({ area, status_class: `${Math.floor(status / 100)}xx` });
  httpDuration.observe({ area }, seconds);
}

/** A snapshot's fate at ingest: stored, already stored, or refused (with its error code). */
export type IngestOutcome = IngestResult['status'] | 'rejected';

const ingestSnapshots = new Counter({
  name: 'turnstone_ingest_snapshots_total',
  help: 'Snapshots posted by gateways, by outcome: each item of a batch counts; a post refused whole (key, rate, body) counts once as rejected.',
  labelNames: ['outcome'] as const,
  registers: [registry],
});

export function countIngest(outcome: IngestOutcome, n = 1): void {
  ingestSnapshots.inc({ outcome }, n);
}

const analyses = new Counter({
  name: 'turnstone_analyses_total',
  help: 'Analysis jobs handled by the workers of this process, by result: stored, retried (to run again later), failed (for good).',
  labelNames: ['result'] as const,
  registers: [registry],
});

const analysisSeconds = new Histogram({
  name: 'turnstone_analysis_compute_seconds',
  help: 'Compute time per capture (a claimed batch’s analysis time divided by its captures).',
  buckets: [0.0005, 0.001, 0.0025, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 1],
  registers: [registry],
});

export function observeAnalyses(captures: number, seconds: number): void {
  if (captures <= 0) return;
  for (let i = 0; i < captures; i++) analysisSeconds.observe(seconds / captures);
}

export function countAnalyses(result: 'stored' | 'retried' | 'failed', n: number): void {
  if (n > 0) analyses.inc({ result }, n);
}

const retentionExpired = new Counter({
  name: 'turnstone_retention_samples_expired_total',
  help: 'Raw waveforms dropped by the retention pass (their analyses stay).',
  registers: [registry],
});

const retentionThinned = new Counter({
  name: 'turnstone_retention_spectra_thinned_total',
  help: 'Captures whose spectra the tiered retention pass cleared (scalars and band values stay).',
  registers: [registry],
});

const retentionLastRun = new Gauge({
  name: 'turnstone_retention_last_run_timestamp_seconds',
  help: 'When the retention pass of this process last finished (Unix time).',
  registers: [registry],
});

const retentionDuration = new Gauge({
  name: 'turnstone_retention_last_run_duration_seconds',
  help: 'How long the last retention pass of this process took.',
  registers: [registry],
});

export function recordRetention(
  expired: number,
  seconds: number,
  at = new Date(),
  thinned = 0,
): void {
  retentionExpired.inc(expired);
  retentionThinned.inc(thinned);
  retentionLastRun.set(at.getTime() / 1000);
  retentionDuration.set(seconds);
}
