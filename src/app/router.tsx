import { createBrowserRouter, type RouteObject } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { FullPageSpinner } from '@/components/ui/spinner';
import { NotFoundRoute } from './routes/not-found';
import { RootError, RouteError } from './routes/route-error';

/**
 * Every screen is its own chunk, loaded on first visit; loaders fill the query cache
 * with the same options the screens read, so a page renders with its data.
 */
export function appRoutes(queryClient: QueryClient): RouteObject[] {
  return [
    {
      id: 'root',
      HydrateFallback: FullPageSpinner,
      errorElement: <RootError />,
      children: [
        {
          path: '/sign-in',
          lazy: () => import('./routes/sign-in').then((m) => ({ loader: m.signInLoader(queryClient), Component: m.SignInRoute })),
        },
        { path: '/forgot-password', lazy: () => import('./routes/forgot-password').then((m) => ({ Component: m.ForgotPasswordRoute })) },
        { path: '/reset-password', lazy: () => import('./routes/reset-password').then((m) => ({ Component: m.ResetPasswordRoute })) },
        { path: '/dev/mailbox', lazy: () => import('./routes/mailbox').then((m) => ({ Component: m.MailboxRoute })) },
        { path: '/accept-invitation', lazy: () => import('./routes/accept-invitation').then((m) => ({ Component: m.AcceptInvitationRoute })) },
        {
          id: 'app',
          lazy: () => import('./routes/app-layout').then((m) => ({ loader: m.appLayoutLoader(queryClient), Component: m.AppLayoutRoute })),
          children: [
            {
              errorElement: <RouteError />,
              children: [
                { index: true, lazy: () => import('./routes/home').then((m) => ({ loader: m.homeLoader(queryClient), Component: m.HomeRoute })) },
                { path: 'claims', lazy: () => import('./routes/claims').then((m) => ({ loader: m.claimsLoader(queryClient), Component: m.ClaimsRoute })) },
                { path: 'claims/new', lazy: () => import('./routes/claim-new').then((m) => ({ loader: m.claimNewLoader(queryClient), Component: m.ClaimNewRoute })) },
                {
                  path: 'claims/:id/edit',
                  lazy: () =>
                    import('./routes/claim-edit').then((m) => ({ loader: m.claimEditLoader(queryClient), Component: m.ClaimEditRoute, ErrorBoundary: m.ClaimEditErrorBoundary })),
                },
                { path: 'review', lazy: () => import('./routes/review-queue').then((m) => ({ loader: m.reviewQueueLoader(queryClient), Component: m.ReviewQueueRoute })) },
                {
                  path: 'claims/:id',
                  lazy: () =>
                    import('./routes/claim').then((m) => ({ loader: m.claimLoader(queryClient), Component: m.ClaimRoute, ErrorBoundary: m.ClaimErrorBoundary })),
                },
                { path: 'payment-runs', lazy: () => import('./routes/payment-runs').then((m) => ({ loader: m.paymentRunsLoader(queryClient), Component: m.PaymentRunsRoute })) },
                { path: 'payment-runs/ready', lazy: () => import('./routes/payment-runs-ready').then((m) => ({ loader: m.readyToPayLoader(queryClient), Component: m.ReadyToPayRoute })) },
                { path: 'payment-runs/:id', lazy: () => import('./routes/payment-runs-detail').then((m) => ({ loader: m.paymentRunLoader(queryClient), Component: m.PaymentRunRoute })) },
                { path: 'users', lazy: () => import('./routes/agency-users').then((m) => ({ loader: m.agencyUsersLoader(queryClient), Component: m.AgencyUsersRoute })) },
                { path: 'catalogue', lazy: () => import('./routes/catalogue').then((m) => ({ loader: m.catalogueLoader(queryClient), Component: m.CatalogueRoute })) },
                { path: 'agencies', lazy: () => import('./routes/agencies').then((m) => ({ loader: m.agenciesLoader(queryClient), Component: m.AgenciesRoute })) },
                {
                  path: 'account/security',
                  lazy: () => import('./routes/account-security').then((m) => ({ loader: m.accountSecurityLoader(queryClient), Component: m.AccountSecurityRoute })),
                },
                { path: '*', Component: NotFoundRoute },
              ],
            },
          ],
        },
      ],
    },
  ];
}

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter(appRoutes(queryClient));
}
