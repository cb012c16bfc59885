/**
 * Every route path in one place. `path` is what the router matches; `getHref()` builds a
 * link. Pages and features link through these, never through string literals.
 */
export const paths = {
  home: {
    path: '/',
    getHref: () => '/',
  },
  auth: {
    signIn: {
      path: '/sign-in',
      /** `redirectTo` is where to go after signing in (a same-origin path). */
      getHref: (redirectTo?: string | null) =>
        redirectTo && redirectTo !== '/'
          ? `/sign-in?redirectTo=${encodeURIComponent(redirectTo)}`
          : '/sign-in',
    },
    forgotPassword: { path: '/forgot-password', getHref: () => '/forgot-password' },
    /** Links in e-mails carry `#token=…`; the token never leaves the browser in a URL. */
    resetPassword: { path: '/reset-password', getHref: () => '/reset-password' },
    acceptInvite: { path: '/accept-invite', getHref: () => '/accept-invite' },
  },
  app: {
    setup: { path: '/setup', getHref: () => '/setup' },
    gateways: { path: '/gateways', getHref: () => '/gateways' },
    audit: {
      path: '/audit',
      getHref: (filter?: { entity: string; entityId: string | number }) =>
        filter
          ? `/audit?entity=${encodeURIComponent(filter.entity)}&entityId=${encodeURIComponent(String(filter.entityId))}`
          : '/audit',
    },
    uploads: { path: '/uploads', getHref: () => '/uploads' },
    users: { path: '/users', getHref: () => '/users' },
    integrations: { path: '/integrations', getHref: () => '/integrations' },
    mailbox: { path: '/mailbox', getHref: () => '/mailbox' },
    account: { path: '/account', getHref: () => '/account' },
    fleet: {
      path: '/fleet',
      getHref: () => '/fleet',
    },
    alerts: {
      path: '/alerts',
      getHref: (alertId?: number) => (alertId ? `/alerts?alert=${alertId}` : '/alerts'),
    },
    limits: {
      path: '/limits',
      getHref: (pointId?: number) => (pointId ? `/limits?point=${pointId}` : '/limits'),
    },
    review: {
      path: '/review',
      getHref: () => '/review',
    },
    point: {
      path: '/points/:pointId',
      /**
       * `band`: open the point on this band (its key, `?band=`): the Trend view on it, or with
       * `view` 'spectrum' the spectrum on its measure and span (`&view=spectrum`). `fromAlert`:
       * the alert whose detail linked here (`&alert=`), offered as the way back to it.
       */
      getHref: (pointId: number, band?: string, view?: 'spectrum', fromAlert?: number) => {
        const q = new URLSearchParams();
        if (band) q.set('band', band);
        if (view) q.set('view', view);
        if (fromAlert) q.set('alert', String(fromAlert));
        const s = q.toString();
        return s ? `/points/${pointId}?${s}` : `/points/${pointId}`;
      },
    },
    machine: {
      path: '/machines/:machineId',
      getHref: (machineId: number) => `/machines/${machineId}`,
    },
  },
} as const;
