import { roles, type Role } from '@turnstone/contracts/role-names';
import { paths } from './paths.ts';

export interface NavigationItem {
  /** Link target, from `paths`. */
  to: string;
  /** Text in the main navigation. */
  label: string;
  /** Roles that see this entry. The API enforces access as well; this only shapes the menu. */
  roles: readonly Role[];
}

/**
 * The main navigation, in display order. Add an entry only when its page exists; a screen
 * for some roles only lists just those roles (e.g. Limits: `['engineer']`).
 */
export const navigation: readonly NavigationItem[] = [
  { to: paths.app.fleet.getHref(), label: 'Fleet', roles },
  { to: paths.app.alerts.getHref(), label: 'Alerts', roles },
  { to: paths.app.limits.getHref(), label: 'Limits', roles: ['engineer'] },
  { to: paths.app.review.getHref(), label: 'Review', roles: ['planner', 'engineer', 'admin'] },
  { to: paths.app.uploads.getHref(), label: 'Uploads', roles: ['engineer', 'admin'] },
  { to: paths.app.setup.getHref(), label: 'Setup', roles: ['admin', 'engineer'] },
  { to: paths.app.gateways.getHref(), label: 'Gateways', roles: ['admin'] },
  { to: paths.app.audit.getHref(), label: 'Audit log', roles: ['admin', 'engineer'] },
  { to: paths.app.users.getHref(), label: 'Users', roles: ['admin'] },
  { to: paths.app.integrations.getHref(), label: 'Integrations', roles: ['admin'] },
  { to: paths.app.mailbox.getHref(), label: 'Mailbox', roles: ['admin'] },
  { to: paths.app.account.getHref(), label: 'Account', roles },
];

export function navigationFor(role: Role): NavigationItem[] {
  return navigation.filter((item) => item.roles.includes(role));
}
