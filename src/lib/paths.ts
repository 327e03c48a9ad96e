/** Every client URL pattern in one place. */
export const paths = {
  home: '/',
  signIn: '/sign-in',
  resetPassword: '/reset-password',
  acceptInvitation: '/accept-invitation',
  account: '/account',
  admin: { users: '/admin/users', sites: '/admin/sites', mailbox: '/admin/mailbox' },
  cases: {
    list: '/cases',
    create: '/cases/new',
    detail: (id: string) => `/cases/${id}`,
    edit: (id: string) => `/cases/${id}/edit`,
  },
  cohorts: { builder: '/cohorts', compare: '/cohorts/compare', funnel: '/cohorts/funnel' },
  worklist: '/worklist',
  dictionary: '/dictionary',
  quality: {
    completeness: '/quality',
    capture: '/quality/capture',
    reabstraction: '/quality/reabstraction',
    entry: (id: string) => `/quality/reabstraction/${id}/entry`,
    report: (id: string) => `/quality/reabstraction/${id}/report`,
    findings: '/quality/findings',
  },
  research: { exports: '/research/exports', request: '/research/exports/new', approvals: '/research/approvals', audit: '/research/audit' },
};
