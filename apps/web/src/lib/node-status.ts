import type { NodeStatus } from '@turnstone/contracts/fleet';

/** Our labels for each status; shown as text next to the shape, always. */
export const statusLabels: Record<NodeStatus, string> = {
  danger: 'Danger',
  alert: 'Alert',
  quality: 'Data quality',
  stale: 'No recent data',
  ok: 'OK',
  none: 'Not measured',
};

/** Worst first. Quality and stale rank above ok: a reading we cannot trust needs a look. */
export const statusOrder: readonly NodeStatus[] = [
  'danger',
  'alert',
  'quality',
  'stale',
  'ok',
  'none',
];

/** Whether `value` names a status (a `?status=` in the address, a select's value). */
export function isNodeStatus(value: unknown): value is NodeStatus {
  return statusOrder.includes(value as NodeStatus);
}

const rank: Record<NodeStatus, number> = Object.fromEntries(
  statusOrder.map((status, index) => [status, statusOrder.length - index]),
) as Record<NodeStatus, number>;

/** The worst of several statuses; `none` for an empty list. */
export function worstStatus(statuses: Iterable<NodeStatus>): NodeStatus {
  let worst: NodeStatus = 'none';
  for (const status of statuses) if (rank[status] > rank[worst]) worst = status;
  return worst;
}
