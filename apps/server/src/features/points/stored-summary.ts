/**
 * The analysis summary JSON stored with every analysis, in two parts by how long they live:
 * - the summary (`analyses.summary`), kept for ever with the capture's scalar values: the
 *   record's shape (rate, length, fmax), the bands of the overall values, the SNR, the speed;
 * - the detail, what only a capture that keeps its spectra needs (the spectra's axes and
 *   units, the peaks, the fault frequencies, the quality metrics): stored inside the spectra
 *   BLOB (`encodeSpectra`'s detail), so retention thinning takes it with the spectra.
 * One schema serves the writer (`storedAnalysisOf`, typed by it) and every reader
 * (`readStoredSummary`, `readStoredDetail`, parsed by it). Rows written before the split hold
 * the detail's fields in the summary itself; the schema keeps them, optional, so those rows
 * still read, and `readStoredDetail` takes them from there.
 */
import { z } from 'zod';
import type { SnapshotAnalysis } from '@turnstone/dsp';
import { decodeSpectraDetail } from '@turnstone/db/spectra-codec';
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
  qualityMetrics: z.unknown().optional(),
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

/** The fields that live with the spectra (in rows written before the split: in the summary). */
export const storedDetailSchema = storedSummarySchema.pick({
  qualityMetrics: true,
  spectra: true,
  peaks: true,
  faultFrequencies: true,
});
export type StoredDetail = z.infer<typeof storedDetailSchema>;

/** A stored summary, checked against the schema that wrote it (a malformed row throws). */
export function readStoredSummary(json: unknown): StoredSummary {
  return storedSummarySchema.parse(json);
}

/**
 * The detail of an analysis that still has its spectra: from its spectra BLOB, or, for a row
 * written before the split (its BLOB holds no detail, or it has only the old float32
 * columns), from its summary. Parsed with the schema that wrote it.
 */
export function readStoredDetail(row: { summary: unknown; spectra: Buffer | null }): StoredDetail {
  const inBlob = row.spectra ? decodeSpectraDetail(row.spectra) : undefined;
  return storedDetailSchema.parse(inBlob ?? row.summary);
}

/** An analysis as stored: the summary kept for ever, and the detail kept with the spectra. */
export function storedAnalysisOf(a: SnapshotAnalysis): {
  summary: StoredSummary;
  detail: StoredDetail;
} {
  return {
    summary: {
      schemaVersion: a.schemaVersion,
      sampleRateHz: a.sampleRateHz,
      sampleCount: a.sampleCount,
      durationS: a.durationS,
      fmaxHz: a.fmaxHz,
      isoBand: a.overall.isoBand,
      isoBandHz: a.overall.isoBandHz,
      accelBandHz: a.overall.accelBandHz,
      snrDb: a.quality.snrDb,
      speed: a.speed,
    },
    detail: storedDetailOf(a),
  };
}

function storedDetailOf(a: SnapshotAnalysis): StoredDetail {
  return {
    qualityMetrics: a.quality.metrics,
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
