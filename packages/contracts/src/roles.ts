import { z } from 'zod';

/** The four roles of DESIGN.md. Order matters only for display. */
export const roles = ['admin', 'engineer', 'planner', 'operator'] as const;
export const roleSchema = /* @__PURE__ */ z.enum(roles);
export type Role = z.infer<typeof roleSchema>;

export const roleLabels: Record<Role, string> = {
  admin: 'Administrator',
  engineer: 'Reliability engineer',
  planner: 'Maintenance planner',
  operator: 'Operator',
};
