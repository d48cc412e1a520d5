/**
 * Review over HTTP against a real PostgreSQL: the state machine of API.md as a table (every step
 * from every status for every kind of person), stale versions, an edited endorsed unit going
 * back to draft, comments, the e-mails each step sends (read back as RFC 5322 messages with
 * mailparser), the queue and who may see what.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { and, eq } from 'drizzle-orm';
import { simpleParser, type AddressObject } from 'mailparser';
import { Browser, testApp, type TestApp } from '../support/app.js';
import {
  ADMIN,
  BANKSIA_FLAT,
  LEAD,
  OTHER_ADMIN,
  OTHER_TEACHER,
  PARTNER,
  RELIEF,
  TEACHER,
  addTeacher,
  browsers,
  insertClass,
  insertKit,
  insertLesson,
  insertUnit,
  schoolIds,
  userIds,
  type SignIn,
} from '../support/planning.js';
import {
  activities,
  outbox,
  unitCoauthors,
  unitComments,
  unitEvents,
  units,
} from '../../server/db/schema/index.js';

let t: TestApp;
let as: SignIn;
let ids: Record<string, string> = {};
let kestrel = '';
let classId = '';
let kitTypeId = '';
const COLLEAGUE = 'colleague@kestrel-ridge.example';

before(async () => {
  t = await testApp();
  as = browsers(t.app);
  const db = t.database.db;
  ({ kestrel } = await schoolIds(db));
  await addTeacher(db, BANKSIA_FLAT, OTHER_TEACHER);
  await addTeacher(db, 'Kestrel Ridge Primary School', COLLEAGUE, 'Colleague Teacher');
  ids = await userIds(db);
  classId = await insertClass(db, kestrel, {
    name: '5R',
    yearLevel: 5,
    studentCount: 20,
    devices: 5,
  });
  kitTypeId = await insertKit(db, kestrel, {
    name: 'Review Test Tub',
    parts: [{ code: 'RV-001', name: 'Drive motor', category: 'motor', qty: 2 }],
  });
});

after(async () => {
  await t.close();
});

/** A unit of the demo teacher, co-authored by the partner, shared with the school. */
async function newUnit(
  status: (typeof STATUSES)[number] = 'draft',
  title = 'Review unit',
): Promise<string> {
  const id = await insertUnit(t.database.db, {
    schoolId: kestrel,
    ownerId: ids[TEACHER]!,
    title,
    yearLevel: 5,
    term: 2,
    status,
    visibility: 'school',
  });
  await t.database.db.insert(unitCoauthors).values({ unitId: id, userId: ids[PARTNER]! });
  return id;
}

async function unitRow(id: string) {
  const [row] = await t.database.db.select().from(units).where(eq(units.id, id));
  return row!;
}

const STATUSES = ['draft', 'in-review', 'changes-requested', 'endorsed'] as const;
const ACTIONS = ['submit', 'request-changes', 'endorse', 'reopen'] as const;
type Who = 'owner' | 'coauthor' | 'other teacher' | 'lead' | 'admin' | 'relief';
const PEOPLE: Record<Who, string> = {
  owner: TEACHER,
  coauthor: PARTNER,
  'other teacher': COLLEAGUE,
  lead: LEAD,
  admin: ADMIN,
  relief: RELIEF,
};

/**
 * The rules of API.md written out by hand (not derived from the server's table): who may take
 * each step, and from which status to which.
 */
const RULES: Record<(typeof ACTIONS)[number], { who: Who[]; from: string[]; to: string }> = {
  submit: { who: ['owner', 'coauthor'], from: ['draft', 'changes-requested'], to: 'in-review' },
  'request-changes': { who: ['lead', 'admin'], from: ['in-review'], to: 'changes-requested' },
  endorse: { who: ['lead', 'admin'], from: ['in-review'], to: 'endorsed' },
  reopen: { who: ['owner', 'lead', 'admin'], from: ['endorsed'], to: 'draft' },
};

/** What the route must answer. Relief never reads units; admins do not see drafts (404). */
function expected(action: (typeof ACTIONS)[number], status: string, who: Who) {
  if (who === 'relief' || (who === 'admin' && status === 'draft')) return { code: 404 };
  const rule = RULES[action];
  if (!rule.who.includes(who)) return { code: 403 };
  if (!rule.from.includes(status)) return { code: 409, error: 'invalid-transition' };
  return { code: 200, to: rule.to };
}

describe('POST /api/units/:id/review: the state machine', () => {
  for (const action of ACTIONS) {
    for (const status of STATUSES) {
      it(`${action} from ${status}, for each person`, async () => {
        for (const who of Object.keys(PEOPLE) as Who[]) {
          const id = await newUnit(status);
          const before = await unitRow(id);
          const res = await (
            await as(PEOPLE[who])
          ).post(`/api/units/${id}/review`, {
            action,
            version: before.version,
            ...(action === 'request-changes' ? { comment: 'Add a **test** lesson.' } : {}),
          });
          const want = expected(action, status, who);
          const label = `${action} from ${status} by ${who}`;
          assert.equal(res.status, want.code, `${label}: ${res.text}`);
          const after = await unitRow(id);
          const events = await t.database.db
            .select()
            .from(unitEvents)
            .where(and(eq(unitEvents.unitId, id), eq(unitEvents.action, 'review')));
          if (want.code === 200) {
            assert.equal(res.body.status, want.to, label);
            assert.equal(res.body.version, before.version + 1, label);
            assert.equal(after.status, want.to, label);
            assert.equal(events.length, 1, label);
            assert.equal(events[0]!.actorId, ids[PEOPLE[who]], label);
          } else {
            if (want.error) assert.equal(res.body.error.code, want.error, label);
            assert.equal(after.status, status, label);
            assert.equal(after.version, before.version, label);
            assert.equal(events.length, 0, label);
          }
        }
      });
    }
  }

  it('answers 409 stale-version with the current unit, and changes nothing', async () => {
    const id = await newUnit('in-review');
    const res = await (
      await as(LEAD)
    ).post(`/api/units/${id}/review`, { action: 'endorse', version: 99 });
    assert.equal(res.status, 409);
    assert.equal(res.body.error.code, 'stale-version');
    assert.equal(res.body.error.current.status, 'in-review');
    assert.equal((await unitRow(id)).status, 'in-review');
  });

  it('refuses bad bodies with 400 and every issue, changing nothing', async () => {
    const id = await newUnit('in-review');
    const lead = await as(LEAD);
    const noComment = await lead.post(`/api/units/${id}/review`, {
      action: 'request-changes',
      version: 1,
    });
    assert.equal(noComment.status, 400);
    assert.deepEqual(
      noComment.body.error.details.map((d: { path: string }) => d.path),
      ['comment'],
    );
    const bad = await lead.post(`/api/units/${id}/review`, {
      action: 'approve',
      version: 0,
      comment: 'bell\u0007',
    });
    assert.equal(bad.status, 400);
    assert.deepEqual(bad.body.error.details.map((d: { path: string }) => d.path).sort(), [
      'action',
      'comment',
      'version',
    ]);
    const row = await unitRow(id);
    assert.equal(row.status, 'in-review');
    assert.equal(row.version, 1);
  });

  it('answers 404 to another school and 401 to nobody signed in', async () => {
    const id = await newUnit('in-review');
    const other = await (
      await as(OTHER_ADMIN)
    ).post(`/api/units/${id}/review`, { action: 'endorse', version: 1 });
    assert.equal(other.status, 404);
    const anon = await new Browser(t.app).post(`/api/units/${id}/review`, {
      action: 'endorse',
      version: 1,
    });
    assert.equal(anon.status, 401);
    assert.equal((await unitRow(id)).status, 'in-review');
  });
});

describe('an edit to an endorsed unit', () => {
  it('puts it back to draft, for the unit, a lesson and an activity, and says so', async () => {
    const teacher = await as(TEACHER);
    const id = await newUnit('endorsed');
    const edited = await teacher.patch(`/api/units/${id}`, { version: 1, title: 'Changed' });
    assert.equal(edited.status, 200);
    assert.equal(edited.body.status, 'draft');
    const [event] = await t.database.db
      .select()
      .from(unitEvents)
      .where(and(eq(unitEvents.unitId, id), eq(unitEvents.action, 'review')));
    assert.match(event!.summary, /Endorsed → Draft/);

    const lessonUnit = await newUnit('endorsed');
    const lessonId = await insertLesson(t.database.db, {
      unitId: lessonUnit,
      schoolId: kestrel,
      title: 'Lesson one',
      classId,
      kitTypeId,
      startsAt: '2026-05-04T09:00',
      endsAt: '2026-05-04T09:50',
      groupSize: 3,
    });
    const lesson = await teacher.patch(`/api/lessons/${lessonId}`, { version: 1, title: 'Two' });
    assert.equal(lesson.status, 200, lesson.text);
    assert.equal((await unitRow(lessonUnit)).status, 'draft');

    await t.database.db.update(units).set({ status: 'endorsed' }).where(eq(units.id, lessonUnit));
    const [activity] = await t.database.db
      .insert(activities)
      .values({ lessonId, position: 1, title: 'Build', kind: 'build', minutes: 20 })
      .returning();
    const act = await (
      await as(PARTNER)
    ).patch(`/api/activities/${activity!.id}`, { version: 1, minutes: 25 });
    assert.equal(act.status, 200, act.text);
    assert.equal((await unitRow(lessonUnit)).status, 'draft');
  });

  it('returns to draft on every other kind of edit too, and the lesson answer says so', async () => {
    const teacher = await as(TEACHER);
    const db = t.database.db;
    /** An endorsed unit with one lesson holding two activities. */
    async function endorsedWithLesson() {
      const unitId = await newUnit('endorsed');
      const lessonId = await insertLesson(db, {
        unitId,
        schoolId: kestrel,
        title: 'Lesson one',
        classId,
        kitTypeId,
        startsAt: '2026-05-11T09:00',
        endsAt: '2026-05-11T09:50',
        groupSize: 3,
      });
      const acts = await db
        .insert(activities)
        .values([
          { lessonId, position: 1, title: 'Build', kind: 'build', minutes: 20 },
          { lessonId, position: 2, title: 'Test', kind: 'build', minutes: 10 },
        ])
        .returning();
      return { unitId, lessonId, activityIds: acts.map((a) => a.id) };
    }
    type Endorsed = Awaited<ReturnType<typeof endorsedWithLesson>>;
    const edits: [string, (u: Endorsed) => ReturnType<Browser['get']>][] = [
      [
        'a lesson added',
        (u) =>
          teacher.post(`/api/units/${u.unitId}/lessons`, {
            title: 'Lesson two',
            classId,
            kitTypeId,
            startsAt: '2026-05-12T09:00',
            endsAt: '2026-05-12T09:50',
            groupSize: 3,
          }),
      ],
      [
        'a lesson edited',
        (u) => teacher.patch(`/api/lessons/${u.lessonId}`, { version: 1, room: 'Lab 2' }),
      ],
      ['a lesson deleted', (u) => teacher.delete(`/api/lessons/${u.lessonId}?version=1`)],
      [
        'the lessons put in order',
        (u) =>
          teacher.send('put', `/api/units/${u.unitId}/lesson-order`, {
            version: 1,
            lessonIds: [u.lessonId],
          }),
      ],
      [
        'the activities put in order',
        (u) =>
          teacher.send('put', `/api/lessons/${u.lessonId}/activity-order`, {
            version: 1,
            activityIds: [...u.activityIds].reverse(),
          }),
      ],
      [
        'an activity added',
        (u) =>
          teacher.post(`/api/lessons/${u.lessonId}/activities`, {
            title: 'Reflect',
            kind: 'reflect',
            minutes: 5,
          }),
      ],
      [
        'an activity deleted',
        (u) => teacher.delete(`/api/activities/${u.activityIds[0]}?version=1`),
      ],
    ];
    for (const [label, edit] of edits) {
      const u = await endorsedWithLesson();
      const res = await edit(u);
      assert.ok(res.status >= 200 && res.status < 300, `${label}: ${res.status}`);
      assert.equal((await unitRow(u.unitId)).status, 'draft', label);
      // A lesson's answer carries its unit's status, which the editors warn with.
      if (res.body.unit) assert.equal(res.body.unit.status, 'draft', label);
      const history = await db
        .select()
        .from(unitEvents)
        .where(and(eq(unitEvents.unitId, u.unitId), eq(unitEvents.action, 'review')));
      assert.deepEqual(
        history.map((e) => e.summary),
        ['Edited after endorsement: Endorsed → Draft'],
        label,
      );
    }
    // A refused edit (400) rolls the withdrawal back with it.
    const u = await endorsedWithLesson();
    const bad = await teacher.patch(`/api/lessons/${u.lessonId}`, { version: 1, groupSize: 0 });
    assert.equal(bad.status, 400);
    assert.equal((await unitRow(u.unitId)).status, 'endorsed');
    const read = await teacher.get(`/api/lessons/${u.lessonId}`);
    assert.equal(read.body.unit.status, 'endorsed');
  });

  it('stays endorsed when the edit is refused (stale version), and in review stays in review', async () => {
    const teacher = await as(TEACHER);
    const id = await newUnit('endorsed');
    const stale = await teacher.patch(`/api/units/${id}`, { version: 7, title: 'Changed' });
    assert.equal(stale.status, 409);
    assert.equal((await unitRow(id)).status, 'endorsed');
    const inReview = await newUnit('in-review');
    const ok = await teacher.patch(`/api/units/${inReview}`, { version: 1, title: 'Changed' });
    assert.equal(ok.status, 200);
    assert.equal(ok.body.status, 'in-review');
  });
});

describe('comments', () => {
  it('keeps Markdown as written (shown sanitised), in order, on the unit or one lesson', async () => {
    const id = await newUnit('in-review');
    const lessonId = await insertLesson(t.database.db, {
      unitId: id,
      schoolId: kestrel,
      title: 'Wiring',
      classId,
      kitTypeId,
      startsAt: '2026-05-05T09:00',
      endsAt: '2026-05-05T09:50',
      groupSize: 3,
    });
    const lead = await as(LEAD);
    const script = 'Looks good <script>alert(1)</script> **bold**';
    const first = await lead.post(`/api/units/${id}/comments`, { body: script });
    assert.equal(first.status, 201, first.text);
    const second = await (
      await as(TEACHER)
    ).post(`/api/units/${id}/comments`, { body: 'Fixed the wiring.', lessonId });
    assert.equal(second.status, 201);
    const list = await lead.get(`/api/units/${id}/comments`);
    assert.equal(list.status, 200);
    assert.deepEqual(
      list.body.comments.map((c: { body: string; lessonId: string | null }) => [
        c.body,
        c.lessonId,
      ]),
      [
        [script, null],
        ['Fixed the wiring.', lessonId],
      ],
    );
    // The JSON answer is data, never HTML: the client renders it through the sanitiser.
    assert.match(list.headers['content-type'] ?? '', /application\/json/);
    // The lead commented without deciding.
    assert.equal((await unitRow(id)).status, 'in-review');
  });

  it('refuses an empty body, control characters and another unit’s lesson (400, nothing saved)', async () => {
    const id = await newUnit('in-review');
    const otherUnit = await newUnit('draft');
    const otherLesson = await insertLesson(t.database.db, {
      unitId: otherUnit,
      schoolId: kestrel,
      title: 'Elsewhere',
      classId,
      kitTypeId,
      startsAt: '2026-05-06T09:00',
      endsAt: '2026-05-06T09:50',
      groupSize: 3,
    });
    const lead = await as(LEAD);
    for (const body of [
      { body: '   ' },
      { body: 'x'.repeat(5001) },
      { body: 'nul\u0000' },
      { body: 'fine', lessonId: otherLesson },
      { body: 'fine', lessonId: 'not-an-id' },
    ]) {
      const res = await lead.post(`/api/units/${id}/comments`, body);
      assert.equal(res.status, 400, JSON.stringify(body));
    }
    const saved = await t.database.db
      .select()
      .from(unitComments)
      .where(eq(unitComments.unitId, id));
    assert.equal(saved.length, 0);
  });

  it('lets authors, leads and (once sent) admins comment; not relief, strangers or nobody', async () => {
    const draft = await newUnit('draft');
    const sent = await newUnit('in-review');
    assert.equal(
      (await (await as(ADMIN)).post(`/api/units/${sent}/comments`, { body: 'ok' })).status,
      201,
    );
    assert.equal((await (await as(ADMIN)).get(`/api/units/${draft}/comments`)).status, 404);
    assert.equal(
      (await (await as(RELIEF)).post(`/api/units/${sent}/comments`, { body: 'x' })).status,
      404,
    );
    assert.equal((await (await as(OTHER_TEACHER)).get(`/api/units/${sent}/comments`)).status, 404);
    assert.equal((await new Browser(t.app).get(`/api/units/${sent}/comments`)).status, 401);
  });
});

/** Where the mailbox stands once every message queued so far has been delivered. */
async function mailMark(): Promise<number> {
  await t.outbox.drain();
  return t.smtp.raw().length;
}

/** The messages that arrived since `from`, parsed from their RFC 5322 source by mailparser. */
async function mailSince(from: number) {
  await t.outbox.drain();
  const raw = t.smtp.raw().slice(from);
  const parsed = await Promise.all(raw.map((r) => simpleParser(r)));
  return parsed.map((m) => ({
    to: ([] as AddressObject[]).concat(m.to ?? []).flatMap((a) => a.value.map((v) => v.address)),
    subject: m.subject ?? '',
    text: m.text ?? '',
  }));
}

describe('e-mail at each step', () => {
  it('submit → the leads; request changes and endorse → owner and co-authors; comment → the others', async () => {
    const id = await newUnit('draft', 'Mail unit');
    const teacher = await as(TEACHER);
    const lead = await as(LEAD);
    let mark = await mailMark();

    assert.equal(
      (await teacher.post(`/api/units/${id}/review`, { action: 'submit', version: 1 })).status,
      200,
    );
    let mail = await mailSince(mark);
    assert.deepEqual(mail.map((m) => m.to).flat(), [LEAD]);
    assert.match(mail[0]!.subject, /Mail unit/);
    assert.ok(mail[0]!.text.includes(`http://127.0.0.1:3999/review/units/${id}`));

    mark = await mailMark();
    const asked = await lead.post(`/api/units/${id}/review`, {
      action: 'request-changes',
      version: 2,
      comment: 'Add a pack-away check.',
    });
    assert.equal(asked.status, 200);
    mail = await mailSince(mark);
    assert.deepEqual(
      mail
        .map((m) => m.to)
        .flat()
        .sort(),
      [PARTNER, TEACHER].sort(),
    );
    for (const m of mail) {
      assert.ok(m.text.includes('> Add a pack-away check.'));
      assert.ok(m.text.includes(`http://127.0.0.1:3999/units/${id}`));
    }
    // The step's comment is kept among the unit's comments.
    const comments = await lead.get(`/api/units/${id}/comments`);
    assert.deepEqual(
      comments.body.comments.map((c: { step: string }) => c.step),
      ['request-changes'],
    );

    mark = await mailMark();
    assert.equal(
      (await (await as(PARTNER)).post(`/api/units/${id}/comments`, { body: 'Done.' })).status,
      201,
    );
    mail = await mailSince(mark);
    assert.deepEqual(
      mail
        .map((m) => m.to)
        .flat()
        .sort(),
      [LEAD, TEACHER].sort(),
    );

    mark = await mailMark();
    assert.equal(
      (await teacher.post(`/api/units/${id}/review`, { action: 'submit', version: 3 })).status,
      200,
    );
    assert.equal(
      (await lead.post(`/api/units/${id}/review`, { action: 'endorse', version: 4 })).status,
      200,
    );
    mail = await mailSince(mark);
    assert.deepEqual(
      mail
        .map((m) => m.to)
        .flat()
        .sort(),
      [LEAD, PARTNER, TEACHER].sort(),
    );
    assert.ok(mail.some((m) => /endorsed/.test(m.subject)));
  });

  it('sends nothing when the step is refused', async () => {
    const id = await newUnit('draft');
    const before = (await t.database.db.select().from(outbox)).length;
    await (await as(LEAD)).post(`/api/units/${id}/review`, { action: 'endorse', version: 1 });
    assert.equal((await t.database.db.select().from(outbox)).length, before);
  });
});

describe('the review queue and a unit’s review page', () => {
  it('lists units in review, oldest first, with days waiting; leads and admins only', async () => {
    const older = await newUnit('in-review', 'Queue older');
    const newer = await newUnit('in-review', 'Queue newer');
    const db = t.database.db;
    await db
      .update(units)
      .set({ submittedAt: new Date(Date.now() - 3 * 86_400_000) })
      .where(eq(units.id, older));
    await db.update(units).set({ submittedAt: new Date() }).where(eq(units.id, newer));
    const res = await (await as(LEAD)).get('/api/review/queue?yearLevel=5');
    assert.equal(res.status, 200);
    const rows = res.body.units as { id: string; daysWaiting: number }[];
    const a = rows.findIndex((r) => r.id === older);
    const b = rows.findIndex((r) => r.id === newer);
    assert.ok(a >= 0 && b > a);
    assert.equal(rows[a]!.daysWaiting, 3);
    assert.equal((await (await as(ADMIN)).get('/api/review/queue')).status, 200);
    assert.equal((await (await as(TEACHER)).get('/api/review/queue')).status, 403);
    assert.equal((await (await as(RELIEF)).get('/api/review/queue')).status, 403);
    assert.equal((await (await as(LEAD)).get('/api/review/queue?yearLevel=40')).status, 400);
    const other = await (await as(OTHER_ADMIN)).get('/api/review/queue');
    assert.ok(!other.body.units.some((r: { id: string }) => r.id === older));
  });

  it('shows the unit with its lessons’ prep and the steps the reviewer may take', async () => {
    const id = await newUnit('in-review');
    await insertLesson(t.database.db, {
      unitId: id,
      schoolId: kestrel,
      title: 'Motors',
      classId,
      kitTypeId,
      startsAt: '2026-05-07T09:00',
      endsAt: '2026-05-07T09:50',
      groupSize: 4,
    });
    const res = await (await as(LEAD)).get(`/api/review/units/${id}`);
    assert.equal(res.status, 200, res.text);
    assert.deepEqual(res.body.actions, ['request-changes', 'endorse']);
    assert.equal(res.body.lessons.length, 1);
    // 20 students in groups of 4 make 5 groups (PREP-RULES R3, ceiling of 20 / 4).
    const lesson = res.body.lessons[0];
    assert.ok(lesson.groups === 5 || lesson.problems.length > 0, JSON.stringify(lesson));
    assert.equal((await (await as(OTHER_ADMIN)).get(`/api/review/units/${id}`)).status, 404);
    const summary = await (await as(LEAD)).get('/api/review/summary');
    assert.equal(summary.status, 200);
    assert.ok(summary.body.waiting >= 1);
  });
});
