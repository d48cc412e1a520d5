/**
 * Kit types under /api/kit-types: a named parts list, edited as a whole (PUT parts, CSV import)
 * or line by line, with an optional photo per part, and the replacement list (./replacements.ts,
 * a sub-router). Everyone of the school reads them; admins and teachers change them. The data
 * logic is in server/kits/; this file parses, authorises and answers.
 */
import { Router, type RequestHandler } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context.js';
import { HttpError, parse, parseParams } from '../http.js';
import { authorize, type Action } from '../auth/policy.js';
import { requireActor } from '../auth/session.js';
import { readPartsCsv, writePartsCsv } from '../csv/index.js';
import { replacementsRouter } from './replacements.js';
import { requireFile, singleFileUpload, sniffUpload } from '../uploads/index.js';
import { idParamsSchema, uuidSchema } from '../../shared/schemas/common.js';
import {
  kitTypeCreateSchema,
  kitTypeUpdateSchema,
  MAX_CSV_BYTES,
  MAX_PHOTO_BYTES,
  partsReplaceSchema,
  partCreateSchema,
  partUpdateSchema,
  PHOTO_TYPES,
} from '../../shared/schemas/kits.js';
import {
  bumpKitVersion,
  createKitType,
  deleteKitType,
  kitTypeSummaries,
  oneKitType,
  partsOf,
  replaceParts,
  schoolKitType,
  updateKitType,
  withUniqueName,
} from '../kits/kit-types.js';
import {
  addPart,
  deletePartPhoto,
  partPhoto,
  removePart,
  savePartPhoto,
  updatePart,
} from '../kits/parts.js';
import { deleteVersion } from '../db/versions.js';
import { sendDownload, slug } from '../downloads.js';

const partParamsSchema = z.object({ id: uuidSchema, partId: uuidSchema });
const codeParamsSchema = z.object({ id: uuidSchema, code: z.string().min(1).max(64) });

/** Kit types, their parts list (JSON, CSV import and export) and part photos. */
export function kitTypesRouter(ctx: AppContext): Router {
  const router = Router();
  router.use(replacementsRouter(ctx));

  /** Role check, then the kit type must be the school's: both before an upload is read. */
  const kitFor =
    (action: Action): RequestHandler =>
    async (req, res, next) => {
      const actor = requireActor(req);
      authorize(actor, action);
      const { id } = parseParams(idParamsSchema, req);
      res.locals['kit'] = await schoolKitType(ctx.db, actor.schoolId, id);
      next();
    };
  const kitOf = (res: { locals: Record<string, unknown> }) =>
    res.locals['kit'] as { id: string; name: string };

  router.get('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.read');
    res.json({ kitTypes: await kitTypeSummaries(ctx.db, actor.schoolId) });
  });

  router.post('/', async (req, res) => {
    const actor = requireActor(req);
    authorize(actor, 'kits.edit');
    const body = parse(kitTypeCreateSchema, req.body);
    const kitType = await withUniqueName(() =>
      ctx.db.transaction((tx) => createKitType(tx, actor.schoolId, body)),
    );
    res.status(201).json({ kitType });
  });

  router.get('/:id', kitFor('kits.read'), async (req, res) => {
    res.json({ kitType: await oneKitType(ctx.db, requireActor(req).schoolId, kitOf(res).id) });
  });

  router.patch('/:id', kitFor('kits.edit'), async (req, res) => {
    const actor = requireActor(req);
    const { version, ...fields } = parse(kitTypeUpdateSchema, req.body);
    const id = kitOf(res).id;
    const kitType = await withUniqueName(() =>
      ctx.db.transaction((tx) => updateKitType(tx, actor.schoolId, id, version, fields)),
    );
    res.json({ kitType });
  });

  router.delete('/:id', kitFor('kits.edit'), async (req, res) => {
    const actor = requireActor(req);
    await ctx.db.transaction((tx) => deleteKitType(tx, actor.schoolId, kitOf(res)));
    res.status(204).end();
  });

  router.put('/:id/parts', kitFor('kits.edit'), async (req, res) => {
    const actor = requireActor(req);
    const body = parse(partsReplaceSchema, req.body);
    const id = kitOf(res).id;
    const kitType = await ctx.db.transaction(async (tx) => {
      await bumpKitVersion(tx, actor.schoolId, id, body.version);
      await replaceParts(tx, id, body.parts);
      return oneKitType(tx, actor.schoolId, id);
    });
    res.json({ kitType });
  });

  router.post('/:id/parts', kitFor('kits.edit'), async (req, res) => {
    const actor = requireActor(req);
    const body = parse(partCreateSchema, req.body);
    const kitType = await ctx.db.transaction((tx) =>
      addPart(tx, actor.schoolId, kitOf(res).id, body.version, body.part),
    );
    res.status(201).json({ kitType });
  });

  router.delete('/:id/parts/:partId', kitFor('kits.edit'), async (req, res) => {
    const actor = requireActor(req);
    const { partId } = parseParams(partParamsSchema, req);
    const version = deleteVersion(req.query);
    const kitType = await ctx.db.transaction((tx) =>
      removePart(tx, actor.schoolId, kitOf(res).id, partId, version),
    );
    res.json({ kitType });
  });

  router.patch('/:id/parts/:partId', kitFor('kits.edit'), async (req, res) => {
    const actor = requireActor(req);
    const { partId } = parseParams(partParamsSchema, req);
    const body = parse(partUpdateSchema, req.body);
    const kitType = await ctx.db.transaction((tx) =>
      updatePart(tx, actor.schoolId, kitOf(res).id, partId, body),
    );
    res.json({ kitType });
  });

  router.post(
    '/:id/parts/import',
    kitFor('kits.edit'),
    singleFileUpload({ maxBytes: MAX_CSV_BYTES }),
    async (req, res) => {
      const actor = requireActor(req);
      const file = requireFile(req);
      await sniffUpload(file.buffer, ['text/csv']);
      // The sniff proved the bytes are UTF-8; TextDecoder drops a leading byte-order mark.
      const read = await readPartsCsv(new TextDecoder('utf-8').decode(file.buffer));
      const list = read.parts;
      if (read.problemCount) {
        const lines = read.problemLines;
        const listed =
          read.problemCount > read.errors.length
            ? ` The first ${read.errors.length} of its ${read.problemCount.toLocaleString('en')} problems are listed.`
            : '';
        throw new HttpError(
          422,
          'csv-rows',
          `${lines.toLocaleString('en')} ${lines === 1 ? 'line needs' : 'lines need'} attention. ` +
            `Nothing was imported.${listed}`,
          read.errors,
        );
      }
      const id = kitOf(res).id;
      await ctx.db.transaction(async (tx) => {
        await bumpKitVersion(tx, actor.schoolId, id);
        await replaceParts(tx, id, list);
      });
      res.json({ imported: list.length });
    },
  );

  router.get('/:id/parts.csv', kitFor('kits.read'), async (_req, res) => {
    const kit = kitOf(res);
    const list = await partsOf(ctx.db, kit.id);
    sendDownload(
      res,
      'text/csv; charset=utf-8',
      `${slug(kit.name, 'kit')}-parts.csv`,
      writePartsCsv(list),
    );
  });

  /** PUT answers 201 when the part had no photo, 200 when one was replaced (RFC 9110 §9.3.4). */
  router.put(
    '/:id/parts/:code/photo',
    kitFor('kits.edit'),
    singleFileUpload({ maxBytes: MAX_PHOTO_BYTES }),
    async (req, res) => {
      const { code } = parseParams(codeParamsSchema, req);
      const file = requireFile(req);
      const contentType = await sniffUpload(file.buffer, PHOTO_TYPES);
      const { created, part } = await savePartPhoto(
        ctx.db,
        kitOf(res).id,
        code,
        contentType,
        file.buffer,
      );
      res.status(created ? 201 : 200).json({ part });
    },
  );

  router.get('/:id/parts/:code/photo', kitFor('kits.read'), async (req, res) => {
    const { code } = parseParams(codeParamsSchema, req);
    const photo = await partPhoto(ctx.db, kitOf(res).id, code);
    // The type was sniffed at upload; nosniff stops a browser from guessing another one.
    res.setHeader('Content-Type', photo.contentType);
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Content-Disposition', 'inline');
    res.send(photo.bytes);
  });

  router.delete('/:id/parts/:code/photo', kitFor('kits.edit'), async (req, res) => {
    const { code } = parseParams(codeParamsSchema, req);
    await deletePartPhoto(ctx.db, kitOf(res).id, code);
    res.status(204).end();
  });

  return router;
}
