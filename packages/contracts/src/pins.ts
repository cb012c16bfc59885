/** Pinned captures: retention keeps them whole (spectra and raw waveform). */
import { z } from 'zod';

/** PUT /analyses/:id/pin */
export const pinInputSchema = z
  .object({
    note: z
      .string()
      .trim()
      .max(200, 'A pin note is at most 200 characters.')
      // eslint-disable-next-line no-control-regex -- control characters are what is refused
      .refine((v) => !/[\u0000-\u001f\u007f]/.test(v), 'A pin note is one line of text.')
      .default(''),
  })
  .strict();

export const pinSchema = z.object({
  analysisId: z.number().int(),
  by: z.string(),
  at: z.string(),
  note: z.string(),
});
