import type { Router } from 'express';
import type { AppDeps } from './lib/deps';

/**
 * Every API module is mounted here, in one list, so the authorization-matrix test can
 * compare the routes Express knows with the routes its table covers.
 */
export function mountApi(api: Router, deps: AppDeps): void {
  void api;
  void deps;
}
