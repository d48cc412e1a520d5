/**
 * Printables: the lesson pack, tray labels and prep calendar of a lesson, and the pack and prep
 * calendar of a unit. Each request reads the data in one read-only snapshot, computes the prep
 * plan, and (for PDFs) hands a plain JSON job to the worker pool; nothing is cached, so a file
 * always matches what is stored at that moment. Read access as for the lesson or unit itself.
 * The lessons router mounts the lesson's files, the units router the unit's.
 */
import { Router, type Request } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context.js';
import type { Tx } from '../db/client.js';
import { HttpError, notFound, parse, parseParams } from '../http.js';
import { requireActor } from '../auth/session.js';
import { readableLesson, readableUnit } from '../planning/access.js';
import { idParamsSchema } from '../../shared/schemas/common.js';
import type { LessonPackModel } from '../pdf/model.js';
import { loadLessonPack, loadPrintContext, loadUnitPack } from '../pdf/load.js';
import { renderForResponse } from '../pdf/respond.js';
import { lessonFileStem, sendDownload, unitFileStem } from '../downloads.js';
import { trayLabelCodes } from '../trays/labels.js';
import { notPlannable } from '../prep/plan-lesson.js';
import { prepCalendar } from '../calendar/prep-calendar.js';
import { loadPackAttachments } from '../pdf/load-attachments.js';

const unitPackQuery = z.object({
  attachments: z
    .enum(['include', 'none'], { message: 'Choose include or none for the build instructions.' })
    .optional(),
});

type Snapshot = <T>(work: (tx: Tx) => Promise<T>) => Promise<T>;

function unplannable(lesson: LessonPackModel): HttpError {
  return notPlannable(
    lesson.problems.map((message) => ({ path: '', message })),
    'This lesson cannot be planned yet, so there is nothing to print.',
  );
}

function snapshotOf(ctx: AppContext): Snapshot {
  return (work) =>
    ctx.db.transaction(work, { isolationLevel: 'repeatable read', accessMode: 'read only' });
}

/** A lesson's pack, tray labels and prep calendar, mounted inside the lessons router. */
export function lessonPrintablesRouter(ctx: AppContext): Router {
  const router = Router();
  const snapshot = snapshotOf(ctx);
  const lessonUrl = (lessonId: string) =>
    `${ctx.config.appUrl.replace(/\/+$/, '')}/lessons/${lessonId}/prep`;

  /** The lesson's model and print context, after the read check (404 when not readable). */
  async function lessonFor(req: Request, withAttachments = false) {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    // The one clock reading of the request: the time printed on every page.
    const generatedAt = new Date();
    return snapshot(async (tx) => {
      await readableLesson(tx, actor, id);
      const lesson = await loadLessonPack(tx, id);
      if (!lesson) throw notFound('That lesson');
      return {
        lesson,
        print: await loadPrintContext(tx, actor.schoolId, generatedAt),
        attachments: withAttachments ? await loadPackAttachments(tx, [id]) : [],
      };
    });
  }

  router.get('/:id/pack.pdf', async (req, res) => {
    const { lesson, print, attachments } = await lessonFor(req, true);
    if (!lesson.plan) throw unplannable(lesson);
    const bytes = await renderForResponse(res, {
      kind: 'lesson-pack',
      print,
      lesson,
      attachments,
    });
    if (bytes) sendDownload(res, 'application/pdf', `${lessonFileStem(lesson)}.pdf`, bytes);
  });

  router.get('/:id/labels.pdf', async (req, res) => {
    const { lesson, print } = await lessonFor(req);
    const plan = lesson.plan;
    if (!plan) throw unplannable(lesson);
    const trays = await trayLabelCodes(
      ctx,
      lesson.id,
      plan.groups.map((g) => g.number),
    );
    const bytes = await renderForResponse(res, {
      kind: 'labels',
      print,
      lesson: { ...lesson, plan },
      ...trays,
    });
    if (bytes)
      sendDownload(res, 'application/pdf', `${lessonFileStem(lesson)}-tray-labels.pdf`, bytes);
  });

  router.get('/:id/prep.ics', async (req, res) => {
    const { lesson, print } = await lessonFor(req);
    if (!lesson.plan) throw unplannable(lesson);
    const text = prepCalendar({
      name: `Trayplan prep: ${lesson.unitTitle}, lesson ${lesson.number}`,
      timezone: print.timezone,
      generatedAt: print.generatedAt,
      lessons: [lesson],
      lessonUrl,
    });
    sendDownload(res, 'text/calendar; charset=utf-8', `${lessonFileStem(lesson)}-prep.ics`, text);
  });

  return router;
}

/** A unit's pack and prep calendar, mounted inside the units router. */
export function unitPrintablesRouter(ctx: AppContext): Router {
  const router = Router();
  const snapshot = snapshotOf(ctx);
  const lessonUrl = (lessonId: string) =>
    `${ctx.config.appUrl.replace(/\/+$/, '')}/lessons/${lessonId}/prep`;

  async function unitFor(req: Request, withAttachments = false) {
    const actor = requireActor(req);
    const { id } = parseParams(idParamsSchema, req);
    const generatedAt = new Date();
    return snapshot(async (tx) => {
      await readableUnit(tx, actor, id);
      const unit = await loadUnitPack(tx, id);
      if (!unit) throw notFound('That unit');
      return {
        ...unit,
        print: await loadPrintContext(tx, actor.schoolId, generatedAt),
        attachments: withAttachments
          ? await loadPackAttachments(
              tx,
              unit.lessons.map((l) => l.id),
            )
          : [],
      };
    });
  }

  router.get('/:id/pack.pdf', async (req, res) => {
    // `?attachments=none` leaves the build instructions out (a shorter file to print).
    const { attachments: mode } = parse(unitPackQuery, req.query);
    const { unit, lessons, print, attachments } = await unitFor(req, mode !== 'none');
    const bytes = await renderForResponse(res, {
      kind: 'unit-pack',
      print,
      unit,
      lessons,
      attachments,
    });
    const stem = unitFileStem(
      unit.title,
      lessons.map((l) => l.className),
    );
    if (bytes) sendDownload(res, 'application/pdf', `${stem}-unit-pack.pdf`, bytes);
  });

  router.get('/:id/prep.ics', async (req, res) => {
    const { unit, lessons, print } = await unitFor(req);
    const text = prepCalendar({
      name: `Trayplan prep: ${unit.title}`,
      timezone: print.timezone,
      generatedAt: print.generatedAt,
      lessons,
      lessonUrl,
    });
    const stem = unitFileStem(
      unit.title,
      lessons.map((l) => l.className),
    );
    sendDownload(res, 'text/calendar; charset=utf-8', `${stem}-prep.ics`, text);
  });

  return router;
}
