/**
 * Why a machine is in alert: `GET /api/v1/machines/:id/attention` — its open alerts (danger
 * first) and the findings not yet done on its points, each naming its point and band.
 */
import { z } from 'zod';
import { alertSchema } from './alerts.ts';
import { findingSchema } from './findings.ts';

export const machineAttentionSchema = z.object({
  /** Raised or acknowledged; danger before alert, then newest activity first. */
  alerts: z.array(alertSchema),
  /** Open or planned; last changed first. */
  findings: z.array(findingSchema),
});
export type MachineAttention = z.infer<typeof machineAttentionSchema>;
