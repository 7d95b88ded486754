import type { Router } from 'express';
import type { AppDeps } from './lib/deps';
import { authRouter } from './modules/auth/auth.router';
import { createSecondFactorService } from './modules/second-factor/second-factor.service';
import { accountSecurityRouter } from './modules/second-factor/second-factor.router';
import { claimsRouter } from './modules/claims/claims.router';
import { unitsRouter } from './modules/units/units.router';
import { catalogRouter } from './modules/catalog/catalog.router';
import { homeRouter } from './modules/home/home.router';
import { devRouter } from './modules/dev/dev.router';
import { attachmentsRouter } from './modules/attachments/attachments.router';
import { evidenceChangesRouter } from './modules/attachments/evidence-changes.router';
import { readingsRouter } from './modules/readings/readings.router';
import { agencyRouter, postalCodesRouter } from './modules/agency/agency.router';
import { invitationsRouter } from './modules/invitations/invitations.router';
import { adminRouter } from './modules/admin/admin.router';
import { paymentsRouter } from './modules/payments/payments.router';
import { partReturnsRouter } from './modules/part-returns/part-returns.router';
import { exportsRouter } from './modules/exports/exports.router';

/**
 * Every API module is mounted here, in one list, so the authorization-matrix test can
 * compare the routes Express knows with the routes its table covers.
 */
export function mountApi(api: Router, deps: AppDeps): void {
  // One second-factor service (and so one set of code-guess counters) for sign-in, step-up and the account page.
  const secondFactor = createSecondFactorService(deps);
  api.use('/auth', authRouter(deps, { limits: deps.authLimits, secondFactor }));
  api.use('/account/security', accountSecurityRouter(deps, secondFactor));
  api.use('/claims', claimsRouter(deps));
  api.use(attachmentsRouter(deps));
  api.use(evidenceChangesRouter(deps));
  api.use(readingsRouter(deps));
  api.use('/units', unitsRouter(deps));
  api.use('/catalog', catalogRouter(deps));
  api.use('/home', homeRouter(deps));
  api.use('/agency', agencyRouter(deps));
  api.use('/postal-codes', postalCodesRouter());
  api.use('/invitations', invitationsRouter(deps));
  api.use('/admin', adminRouter(deps));
  api.use('/payment-runs', paymentsRouter(deps));
  api.use(partReturnsRouter(deps));
  api.use('/exports', exportsRouter(deps));
  const dev = devRouter(deps);
  if (dev) api.use('/dev', dev);
}
