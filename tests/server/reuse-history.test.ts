/**
 * A unit's history (GET /api/units/:id/history), what changed upstream since a copy (GET
 * /api/units/:id/upstream), co-authors told by e-mail, and the seeded 4M copy's provenance,
 * against a real PostgreSQL.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { eq } from 'drizzle-orm';
import type { Response } from 'supertest';
import { Browser, testApp, type TestApp } from '../support/app.js';
import {
  ADMIN,
  BANKSIA_FLAT,
  LEAD,
  OTHER_TEACHER,
  PARTNER,
  RELIEF,
  TEACHER,
  addTeacher,
  browsers,
  insertClass,
  insertKit,
  insertTubs,
  schoolIds,
  userIds,
  type SignIn,
} from '../support/planning.js';
import { outbox, unitEvents, units } from '../../server/db/schema/index.js';

let t: TestApp;
let as: SignIn;
let ids: Record<string, string> = {};
let classId = '';
let kitTypeId = '';

/** The answer's JSON once its status is as expected (supertest types a body as `any`). */
function ok(res: Response, status = 200) {
  assert.equal(res.status, status, res.text);
  return res.body;
}

before(async () => {
  t = await testApp();
  as = browsers(t.app);
  const db = t.database.db;
  const { kestrel } = await schoolIds(db);
  await addTeacher(db, BANKSIA_FLAT, OTHER_TEACHER);
  ids = await userIds(db);
  classId = await insertClass(db, kestrel, {
    name: '4H',
    yearLevel: 4,
    studentCount: 24,
    devices: 6,
  });
  kitTypeId = await insertKit(db, kestrel, {
    name: 'History Trial Tub',
    parts: [
      { code: 'HT-MOT', name: 'Drive motor', category: 'motor', qty: 2 },
      { code: 'HT-WHL', name: 'Wheel', category: 'wheel', qty: 4 },
    ],
  });
  await insertTubs(db, kestrel, kitTypeId, ['Tub A', 'Tub B']);
});
after(async () => {
  await t.close();
});

interface Event {
  at: string;
  actor: { id: string | null; name: string };
  action: string;
  summary: string;
}

async function history(unitId: string, email = TEACHER): Promise<Event[]> {
  return ok(await (await as(email)).get(`/api/units/${unitId}/history`)).events;
}
/** The newest event (history is newest first). */
async function latest(unitId: string): Promise<Event> {
  return (await history(unitId))[0]!;
}

async function newUnit(title: string, email = TEACHER) {
  return ok(await (await as(email)).post('/api/units', { title, yearLevel: 4, term: 3 }), 201);
}
async function addLesson(unitId: string, title: string, day: string, email = TEACHER) {
  return ok(
    await (
      await as(email)
    ).post(`/api/units/${unitId}/lessons`, {
      title,
      classId,
      kitTypeId,
      startsAt: `${day}T11:10`,
      endsAt: `${day}T12:00`,
      groupSize: 3,
    }),
    201,
  );
}
async function lesson(id: string, email = TEACHER) {
  return ok(await (await as(email)).get(`/api/lessons/${id}`));
}

describe('GET /api/units/:id/history', () => {
  it('records each kind of change with who, when and a short summary, newest first', async () => {
    const teacher = await as(TEACHER);
    const unit = await newUnit('Bridges');
    let e = await latest(unit.id);
    assert.equal(e.action, 'created');
    assert.deepEqual(e.actor, { id: ids[TEACHER], name: 'Sam Kowhai' });
    assert.ok(Math.abs(Date.parse(e.at) - Date.now()) < 60_000);

    const edited = ok(
      await teacher.patch(`/api/units/${unit.id}`, {
        version: unit.version,
        title: 'Bridges and towers',
        visibility: 'school',
      }),
    );
    e = await latest(unit.id);
    assert.equal(e.action, 'unit-edited');
    assert.equal(e.summary, 'title Bridges → Bridges and towers; visibility private → school');

    const one = await addLesson(unit.id, 'Beams', '2026-08-04');
    e = await latest(unit.id);
    assert.deepEqual(
      [e.action, e.summary],
      ['lesson-added', 'added lesson Beams (2026-08-04 11:10–12:00)'],
    );
    const two = await addLesson(unit.id, 'Towers', '2026-08-11');

    ok(await teacher.patch(`/api/lessons/${one.id}`, { version: one.version, groupSize: 4 }));
    e = await latest(unit.id);
    assert.deepEqual([e.action, e.summary], ['lesson-edited', 'Beams: group size 3 → 4']);

    const act = ok(
      await teacher.post(`/api/lessons/${one.id}/activities`, {
        title: 'Test run',
        kind: 'test',
        minutes: 10,
        materials: [{ partCode: 'HT-WHL', qty: 4, per: 'group' }],
      }),
      201,
    );
    e = await latest(unit.id);
    // Issue 10's own example wording: "added activity Test run".
    assert.deepEqual([e.action, e.summary], ['activity-added', 'Beams: added activity Test run']);

    ok(
      await teacher.patch(`/api/activities/${act.id}`, {
        version: act.version,
        minutes: 15,
        materials: [
          { partCode: 'HT-WHL', qty: 6, per: 'group' },
          { partCode: 'HT-MOT', qty: 1, per: 'group' },
        ],
      }),
    );
    e = await latest(unit.id);
    assert.equal(e.action, 'activity-edited');
    assert.equal(
      e.summary,
      'Beams, Test run: minutes 10 → 15; Wheel 4 per group → 6 per group; added Drive motor ×1 per group',
    );

    const second = ok(
      await teacher.post(`/api/lessons/${one.id}/activities`, {
        title: 'Tidy up',
        kind: 'other',
        minutes: 5,
      }),
      201,
    );
    const beams = await lesson(one.id);
    ok(
      await teacher.send('put', `/api/lessons/${one.id}/activity-order`, {
        version: beams.version,
        activityIds: [second.id, act.id],
      }),
    );
    assert.equal((await latest(unit.id)).summary, 'Beams: activities reordered');

    ok(await teacher.delete(`/api/activities/${second.id}`), 204);
    e = await latest(unit.id);
    assert.deepEqual(
      [e.action, e.summary],
      ['activity-removed', 'Beams: removed activity Tidy up'],
    );

    const current = ok(await teacher.get(`/api/units/${unit.id}`));
    ok(
      await teacher.send('put', `/api/units/${unit.id}/lesson-order`, {
        version: current.version,
        lessonIds: [two.id, one.id],
      }),
    );
    assert.equal((await latest(unit.id)).summary, 'lessons reordered');

    ok(await teacher.delete(`/api/lessons/${two.id}`), 204);
    e = await latest(unit.id);
    assert.deepEqual(
      [e.action, e.summary],
      ['lesson-removed', 'removed lesson Towers (2026-08-11 11:10–12:00)'],
    );

    const all = await history(unit.id);
    assert.deepEqual(
      all.map((x) => x.action),
      [
        'lesson-removed',
        'unit-edited',
        'activity-removed',
        'lesson-edited',
        'activity-added',
        'activity-edited',
        'activity-added',
        'lesson-edited',
        'lesson-added',
        'lesson-added',
        'unit-edited',
        'created',
      ],
    );
    for (let i = 1; i < all.length; i++) assert.ok(all[i - 1]!.at >= all[i]!.at, 'newest first');
    assert.equal(edited.title, 'Bridges and towers');
  });

  it('writes nothing for a refused or stale edit (same transaction as the change)', async () => {
    const teacher = await as(TEACHER);
    const unit = await newUnit('Levers');
    const l = await addLesson(unit.id, 'Seesaw', '2026-08-05');
    const count = (await history(unit.id)).length;
    assert.equal(
      (await teacher.patch(`/api/lessons/${l.id}`, { version: l.version, groupSize: 99 })).status,
      400,
    );
    ok(await teacher.patch(`/api/lessons/${l.id}`, { version: l.version, room: 'Hall' }));
    const stale = await teacher.patch(`/api/lessons/${l.id}`, { version: l.version, room: 'Lab' });
    assert.equal(stale.status, 409);
    const stalePatch = await teacher.patch(`/api/units/${unit.id}`, {
      version: unit.version,
      title: 'Lost',
    });
    ok(stalePatch);
    assert.equal(
      (await teacher.patch(`/api/units/${unit.id}`, { version: unit.version, title: 'Again' }))
        .status,
      409,
    );
    const after = await history(unit.id);
    assert.equal(after.length, count + 2, 'the room edit and the title edit only');
    assert.equal(after[1]!.summary, 'Seesaw: room (none) → Hall');
  });

  it('is read by whoever reads the unit; others 404; anonymous 401', async () => {
    const unit = await newUnit('Pulleys');
    assert.equal((await (await as(TEACHER)).get(`/api/units/${unit.id}/history`)).status, 200);
    assert.equal((await (await as(LEAD)).get(`/api/units/${unit.id}/history`)).status, 200);
    for (const who of [PARTNER, ADMIN, RELIEF, OTHER_TEACHER])
      assert.equal((await (await as(who)).get(`/api/units/${unit.id}/history`)).status, 404, who);
    assert.equal((await new Browser(t.app).get(`/api/units/${unit.id}/history`)).status, 401);
  });
});

describe('GET /api/units/:id/upstream', () => {
  it('lists what changed in the original since the copy, and nothing before', async () => {
    const teacher = await as(TEACHER);
    const partner = await as(PARTNER);
    let unit = await newUnit('Gears');
    unit = ok(await teacher.patch(`/api/units/${unit.id}`, { version: 1, visibility: 'school' }));
    const first = await addLesson(unit.id, 'Spur gears', '2026-08-04');
    const second = await addLesson(unit.id, 'Worm gears', '2026-08-11');
    const act = ok(
      await teacher.post(`/api/lessons/${first.id}/activities`, {
        title: 'Gear train',
        kind: 'build',
        minutes: 20,
        materials: [{ partCode: 'HT-WHL', qty: 2, per: 'group' }],
      }),
      201,
    );
    const copy = ok(await partner.post(`/api/units/${unit.id}/copy`, {}), 201);
    let up = ok(await partner.get(`/api/units/${copy.id}/upstream`));
    assert.deepEqual(up, {
      basedOn: copy.basedOn,
      sourceVersion: copy.basedOn.version,
      changed: false,
      changes: [],
    });

    // The teacher keeps working on the original.
    const fresh = ok(await teacher.get(`/api/units/${unit.id}`));
    ok(
      await teacher.patch(`/api/units/${unit.id}`, { version: fresh.version, title: 'Gear work' }),
    );
    ok(
      await teacher.patch(`/api/lessons/${first.id}`, {
        version: first.version,
        startsAt: '2026-08-04T11:20',
        endsAt: '2026-08-04T12:10',
      }),
    );
    ok(
      await teacher.patch(`/api/activities/${act.id}`, {
        version: act.version,
        minutes: 25,
        materials: [{ partCode: 'HT-WHL', qty: 3, per: 'group' }],
      }),
    );
    ok(
      await teacher.post(`/api/lessons/${first.id}/activities`, {
        title: 'Show and tell',
        kind: 'reflect',
        minutes: 5,
      }),
      201,
    );
    ok(await teacher.delete(`/api/lessons/${second.id}`), 204);
    await addLesson(unit.id, 'Rack and pinion', '2026-08-18');

    up = ok(await partner.get(`/api/units/${copy.id}/upstream`));
    const [row] = await t.database.db.select().from(units).where(eq(units.id, unit.id));
    assert.equal(up.sourceVersion, row!.version);
    assert.ok(up.sourceVersion > copy.basedOn.version);
    assert.equal(up.changed, true);
    assert.deepEqual(
      up.changes.map((c: { summary: string }) => c.summary),
      [
        'title Gears → Gear work',
        'Spur gears: time 2026-08-04 11:10–12:00 → 2026-08-04 11:20–12:10; ' +
          'Gear train: minutes 20 → 25; Wheel 2 per group → 3 per group; added activity Show and tell',
        'added lesson Rack and pinion (2026-08-18 11:10–12:00)',
        'removed lesson Worm gears',
      ],
    );
    // The copy itself is untouched.
    const copied = ok(await partner.get(`/api/units/${copy.id}`));
    assert.deepEqual(
      copied.lessons.map((l: { title: string }) => l.title),
      ['Spur gears', 'Worm gears'],
    );
  });

  it('is 404 for an original, an original no longer shared or gone, and other readers', async () => {
    const teacher = await as(TEACHER);
    const partner = await as(PARTNER);
    let unit = await newUnit('Cams');
    assert.equal((await teacher.get(`/api/units/${unit.id}/upstream`)).status, 404, 'an original');
    unit = ok(await teacher.patch(`/api/units/${unit.id}`, { version: 1, visibility: 'school' }));
    const copy = ok(await partner.post(`/api/units/${unit.id}/copy`, {}), 201);
    for (const who of [TEACHER, ADMIN, RELIEF, OTHER_TEACHER])
      assert.equal((await (await as(who)).get(`/api/units/${copy.id}/upstream`)).status, 404, who);
    assert.equal((await new Browser(t.app).get(`/api/units/${copy.id}/upstream`)).status, 401);

    // Made private again: the partner can no longer read it, nor see its changes or link.
    ok(
      await teacher.patch(`/api/units/${unit.id}`, {
        version: unit.version,
        visibility: 'private',
      }),
    );
    assert.equal((await partner.get(`/api/units/${copy.id}/upstream`)).status, 404);
    const hidden = ok(await partner.get(`/api/units/${copy.id}`));
    assert.equal(hidden.basedOn.readable, false);
    assert.equal(hidden.basedOn.title, 'Cams', 'the provenance stays');

    // Gone: the copy keeps its provenance, the upstream answer is 404.
    ok(await teacher.delete(`/api/units/${unit.id}`), 204);
    assert.equal((await partner.get(`/api/units/${copy.id}/upstream`)).status, 404);
    const orphan = ok(await partner.get(`/api/units/${copy.id}`));
    assert.equal(orphan.basedOn.unitId, unit.id);
    assert.equal(orphan.basedOn.readable, false);
  });
});

describe('co-authors', () => {
  it('are e-mailed once when added, and see the unit among their own', async () => {
    const teacher = await as(TEACHER);
    const unit = await newUnit('Wind turbines');
    const outboxBefore = (await t.database.db.select().from(outbox)).length;
    ok(
      await teacher.patch(`/api/units/${unit.id}`, {
        version: unit.version,
        coauthorIds: [ids[PARTNER]],
      }),
    );
    const e = await latest(unit.id);
    assert.equal(e.summary, 'co-authors: added Jordan Pereira');
    await t.outbox.drain();
    let mail = t.smtp.messages().find((m) => m.subject.includes('Wind turbines'));
    for (let i = 0; !mail && i < 50; i++) {
      await new Promise((r) => setTimeout(r, 50));
      mail = t.smtp.messages().find((m) => m.subject.includes('Wind turbines'));
    }
    assert.ok(mail, 'a message to the new co-author');
    assert.deepEqual(mail.to, [PARTNER]);
    assert.equal(mail.subject, 'You are now a co-author of Wind turbines');
    assert.match(mail.text, /Sam Kowhai has added you as a co-author/);
    assert.ok(mail.links.includes(`http://127.0.0.1:3999/units/${unit.id}`));

    // The same list again is no change: no second message.
    const current = ok(await teacher.get(`/api/units/${unit.id}`));
    ok(
      await teacher.patch(`/api/units/${unit.id}`, {
        version: current.version,
        coauthorIds: [ids[PARTNER]],
        overview: 'Blades and gears.',
      }),
    );
    const rows = await t.database.db.select().from(outbox);
    assert.equal(rows.length, outboxBefore + 1);

    const mine = ok(await (await as(PARTNER)).get('/api/units?scope=mine'));
    const listed = mine.units.find((u: { id: string }) => u.id === unit.id);
    assert.ok(listed, 'among the partner’s own units');
    assert.equal(listed.canEdit, true);
    assert.equal(listed.owner.id, ids[TEACHER]);
  });
});

describe('the seeded 4M copy', () => {
  it('is a real copy of Rescue Rovers with its provenance and history', async () => {
    const db = t.database.db;
    const [copy] = await db.select().from(units).where(eq(units.title, 'Rescue Rovers (4M)'));
    const [original] = await db.select().from(units).where(eq(units.title, 'Rescue Rovers'));
    const unit = ok(await (await as(PARTNER)).get(`/api/units/${copy!.id}`));
    assert.deepEqual(unit.basedOn, {
      unitId: original!.id,
      title: 'Rescue Rovers',
      version: original!.version,
      ownerName: 'Sam Kowhai',
      // 15 July 2026, 15:45 in Adelaide (UTC+09:30 in July, IANA data): 06:15 UTC.
      copiedAt: '2026-07-15T06:15:00.000Z',
      readable: true,
    });
    const events = await history(copy!.id, PARTNER);
    assert.equal(events.at(-1)!.action, 'copied');
    assert.equal(events.at(-1)!.summary, 'copied from version 1 of Rescue Rovers by Sam Kowhai');
    assert.ok(events.some((e) => /group size 3 → 4/.test(e.summary)));
    assert.ok(events.every((e) => e.actor.id === ids[PARTNER]));
    const up = ok(await (await as(PARTNER)).get(`/api/units/${copy!.id}/upstream`));
    assert.equal(up.changed, false);
    const stored = await db.select().from(unitEvents).where(eq(unitEvents.unitId, original!.id));
    assert.deepEqual(
      stored.map((e) => e.action),
      ['created'],
    );
  });
});
