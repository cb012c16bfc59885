/**
 * The four roles of DESIGN.md and their names for people, without zod: the web app's shell
 * (navigation, user menu) needs them on its first screen, where no schema is parsed.
 * roles.ts builds the schema from the same list.
 */
export const roles = ['admin', 'engineer', 'planner', 'operator'] as const;
export type Role = (typeof roles)[number];

export const roleLabels: Record<Role, string> = {
  admin: 'Administrator',
  engineer: 'Reliability engineer',
  planner: 'Maintenance planner',
  operator: 'Operator',
};
