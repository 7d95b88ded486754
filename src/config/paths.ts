/** Every client path in one place, so links and redirects never drift apart. */
export const paths = {
  home: '/',
  signIn: '/sign-in',
  forgotPassword: '/forgot-password',
  resetPassword: '/reset-password',
  claims: '/claims',
  claim: (id: string) => `/claims/${encodeURIComponent(id)}`,
  claimNew: '/claims/new',
  claimEdit: (id: string) => `/claims/${encodeURIComponent(id)}/edit`,
  reviewQueue: '/review',
  paymentRuns: '/payment-runs',
  users: '/users',
  catalogue: '/catalogue',
  agencies: '/agencies',
  acceptInvitation: '/accept-invitation',
  mailbox: '/dev/mailbox',
  accountSecurity: '/account/security',
} as const;

/** Sign-in path that returns the user to `to` afterwards. */
export function signInPath(to?: string | null): string {
  const back = safeRedirect(to, '');
  return back && back !== paths.home ? `${paths.signIn}?redirectTo=${encodeURIComponent(back)}` : paths.signIn;
}

/**
 * Only same-site paths may be redirected to after sign-in: "/claims?x=1" passes,
 * "https://elsewhere", "//elsewhere" and "/\\elsewhere" fall back.
 */
export function safeRedirect(to: string | null | undefined, fallback: string = paths.home): string {
  if (!to || !to.startsWith('/') || to.startsWith('//') || to.startsWith('/\\')) return fallback;
  if (to.startsWith(paths.signIn)) return fallback;
  return to;
}
