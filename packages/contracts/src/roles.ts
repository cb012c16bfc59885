import { z } from 'zod';
import { roles } from './role-names.ts';

/** The four roles (role-names.ts holds the list and labels, zod-free). Order matters only for display. */
export { roleLabels, roles, type Role } from './role-names.ts';
export const roleSchema = /* @__PURE__ */ z.enum(roles);
