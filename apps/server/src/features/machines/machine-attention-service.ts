/**
 * Why a machine is red: its open alerts and the findings not done on its points, for the top
 * of the machine page. Reads through the alerts and findings features (one home each).
 */
import type { MachineAttention } from '@turnstone/contracts/machine-attention';
import type { AppContext } from '../../lib/context.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { openAlertsOfMachine } from '../alerts/alerts-service.ts';
import { openFindingsOfMachine } from '../findings/findings-service.ts';
import { accessibleMachine } from '../points/points-service.ts';

export async function machineAttention(
  ctx: AppContext,
  user: SessionUser,
  machineId: number,
): Promise<MachineAttention> {
  await accessibleMachine(ctx.db, user, machineId);
  const [alerts, findings] = await Promise.all([
    openAlertsOfMachine(ctx, user, machineId),
    openFindingsOfMachine(ctx, user, machineId),
  ]);
  return { alerts, findings };
}
