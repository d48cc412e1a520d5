import { inject } from '@angular/core';
import { Router, type CanActivateFn } from '@angular/router';
import type { Role } from '../../../shared/schemas/common';
import { Session } from './session';

/** Lets signed-in users through; sends others to sign in, keeping where they were going. */
export const signedInGuard: CanActivateFn = async (_route, state) => {
  const session = inject(Session);
  const router = inject(Router);
  await session.start();
  if (session.signedIn()) return true;
  const returnUrl = state.url && state.url !== '/' ? { returnUrl: state.url } : undefined;
  return router.createUrlTree(['/sign-in'], { queryParams: returnUrl });
};

/** Keeps signed-in users away from the sign-in page: they go home. */
export const signedOutGuard: CanActivateFn = async () => {
  // inject() only works before the first await.
  const session = inject(Session);
  const router = inject(Router);
  await session.start();
  return session.signedIn() ? router.createUrlTree(['/']) : true;
};

/**
 * Lets users with one of `roles` through and sends everyone else home. It mirrors the server's
 * rules so nobody lands on a page that would only answer 403.
 */
export function roleGuard(roles: readonly Role[]): CanActivateFn {
  return async () => {
    const session = inject(Session);
    const router = inject(Router);
    await session.start();
    const user = session.user();
    if (!user) return router.createUrlTree(['/sign-in']);
    return roles.includes(user.role) ? true : router.createUrlTree(['/']);
  };
}
