import { Router } from 'express';
import type { AppContext } from '../context.js';

/** Placeholder until the planning routes land. */
export function activitiesRouter(_ctx: AppContext): Router {
  return Router();
}
