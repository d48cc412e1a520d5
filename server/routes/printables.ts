import { Router } from 'express';
import type { AppContext } from '../context.js';

/** Placeholder until the printables land (lesson and unit packs, tray labels, prep calendar). */
export function printablesRouter(_ctx: AppContext): Router {
  return Router();
}
