import { inject } from '@angular/core';
import { Router, type CanActivateFn } from '@angular/router';
import { Session } from '../auth/session';

/** A signed-in relief teacher lands on "Today" instead of the week's agenda. */
export const reliefLandsOnToday: CanActivateFn = async () => {
  const session = inject(Session);
  const router = inject(Router);
  await session.start();
  return session.user()?.role === 'relief' ? router.createUrlTree(['/today']) : true;
};
