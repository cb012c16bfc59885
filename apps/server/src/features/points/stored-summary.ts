/**
 * The analysis summary JSON stored with every analysis (`analyses.summary`): what the web app
 * needs to draw the stored spectra besides their values, the speed, the peaks and the
 * fault frequencies. One schema serves the writer (`storedSummaryOf`, typed by it) and every
 * reader (`readStoredSummary`, parsed by it). Fields added over time are optional, so rows
 * written by older versions still read.
 */
import { z } from 'zod';
import type { SnapshotAnalysis } from '@turnstone/dsp';
import { faultFrequencySchema, speedSourceSchema } from '@turnstone/contracts/points';

const bandHz = z.tuple([z.number(), z.number()]);

const spectrumMetaSchema = z.object({
  unit: z.string(),
  scale: z.enum(['rms', 'peak']),
  /** Line spacing of an Hz spectrum. */
  dfHz: z.number().optional(),
  /** Line spacing of an order spectrum. */
  dOrder: z.number().optional(),
  lines: z.number().int(),
  window: z.string().optional(),
  nperseg: z.number().int().optional(),
  averages: z.number().int().optional(),
  lowCutoffHz: z.number().optional(),
  bandHz: bandHz.optional(),
  method: z.string().optional(),
});

export const storedSummarySchema = z.object({
  schemaVersion: z.number().int().optional(),
  sampleRateHz: z.number().optional(),
  sampleCount: z.number().int().optional(),
  durationS: z.number().optional(),
  fmaxHz: z.number().optional(),
  isoBand: z.string().optional(),
  isoBandHz: bandHz.nullish(),
  accelBandHz: bandHz.nullish(),
  snrDb: z.number().nullish(),
  qualityMetrics: z.unknown(),
  speed: z
    .object({ rpm: z.number().nullable(), hz: z.number().nullable(), source: speedSourceSchema })
    .optional(),
  spectra: z
    .object({
      acceleration: spectrumMetaSchema.nullish(),
      velocity: spectrumMetaSchema.nullish(),
      envelope: spectrumMetaSchema.nullish(),
      order: spectrumMetaSchema.nullish(),
    })
    .optional(),
  peaks: z
    .array(z.object({ hz: z.number(), order: z.number().nullable(), amplitude: z.number() }))
    .optional(),
  faultFrequencies: z.array(faultFrequencySchema).optional(),
});
export type StoredSummary = z.infer<typeof storedSummarySchema>;

/** A stored summary, checked against the schema that wrote it (a malformed row throws). */
export function readStoredSummary(json: unknown): StoredSummary {
  return storedSummarySchema.parse(json);
}

/** The summary of an analysis as stored. */
export function storedSummaryOf(a: SnapshotAnalysis): StoredSummary {
  return {
    schemaVersion: a.schemaVersion,
    sampleRateHz: a.sampleRateHz,
    sampleCount: a.sampleCount,
    durationS: a.durationS,
    fmaxHz: a.fmaxHz,
    isoBand: a.overall.isoBand,
    isoBandHz: a.overall.isoBandHz,
    accelBandHz: a.overall.accelBandHz,
    snrDb: a.quality.snrDb,
    qualityMetrics: a.quality.metrics,
    speed: a.speed,
    spectra: {
      acceleration: {
        unit: a.spectra.acceleration.unit,
        scale: a.spectra.acceleration.scale,
        dfHz: a.spectra.acceleration.dfHz,
        window: a.spectra.acceleration.window,
        nperseg: a.spectra.acceleration.nperseg,
        averages: a.spectra.acceleration.averages,
        lines: a.spectra.acceleration.values.length,
      },
      velocity: {
        unit: a.spectra.velocity.unit,
        scale: a.spectra.velocity.scale,
        dfHz: a.spectra.velocity.dfHz,
        lowCutoffHz: a.spectra.velocity.lowCutoffHz,
        lines: a.spectra.velocity.values.length,
      },
      envelope: a.spectra.envelope
        ? {
            unit: a.spectra.envelope.unit,
            scale: a.spectra.envelope.scale,
            dfHz: a.spectra.envelope.dfHz,
            bandHz: a.spectra.envelope.bandHz,
            lines: a.spectra.envelope.values.length,
          }
        : null,
      order: a.spectra.order
        ? {
            unit: a.spectra.order.unit,
            scale: a.spectra.order.scale,
            dOrder: a.spectra.order.dOrder,
            method: a.spectra.order.method,
            lines: a.spectra.order.values.length,
          }
        : null,
    },
    peaks: a.peaks,
    faultFrequencies: a.faultFrequencies,
  };
}
