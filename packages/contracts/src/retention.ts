import { z } from 'zod';

/** The retention policy in force (read-only: set through the server's configuration). */
export const retentionPolicySchema = z.object({
  /** Days raw waveforms are kept (RETENTION_DAYS); 0 keeps them for ever. */
  rawSamplesDays: z.number().int().min(0),
  /** Days every capture keeps its spectra (SPECTRA_WHOLE_DAYS); 0 keeps every spectrum. */
  spectraWholeDays: z.number().int().min(0),
  /** Days until which one capture per point per hour keeps them (SPECTRA_HOURLY_DAYS). */
  spectraHourlyDays: z.number().int().min(0),
  /** Months captures are kept at all (CAPTURE_RETENTION_MONTHS); 0 keeps them for ever. */
  captureMonths: z.number().int().min(0),
  /** ± minutes around alert events and findings kept whole (RETENTION_KEEP_WINDOW_MIN). */
  keepWindowMinutes: z.number().int().min(0),
  batchSize: z.number().int().min(1),
  batchPauseMs: z.number().int().min(0),
  /** When the nightly pass runs (cron, server time). */
  schedule: z.string(),
});
export type RetentionPolicyView = z.infer<typeof retentionPolicySchema>;
