/** The waterfall: recent spectra of one kind, newest first. */
import { z } from 'zod';
import { spectrumKindSchema } from './points.ts';

export const waterfallQuerySchema = z.object({
  kind: spectrumKindSchema.default('acceleration'),
  limit: z.coerce.number().int().min(1).max(50).default(20),
});
export const waterfallSchema = z.object({
  kind: spectrumKindSchema,
  unit: z.string(),
  axis: z.enum(['hz', 'order']),
  /** How the amplitudes are stated (RMS or peak), as the spectrum endpoint says it. */
  scale: z.enum(['rms', 'peak']),
  /** Newest first. Each spectrum carries its own line spacing (settings may change). */
  items: z.array(
    z.object({
      analysisId: z.number().int(),
      takenAt: z.string(),
      step: z.number(),
      values: z.string(),
      /** Running speed of the capture (1× in Hz), to read orders; null when not known. */
      shaftHz: z.number().nullable(),
    }),
  ),
});
export type Waterfall = z.infer<typeof waterfallSchema>;
