/**
 * Calendar files escape every text value as RFC 5545 §3.3.11 says (backslash, semicolon, comma
 * and line breaks escaped; control characters other than HTAB are not TEXT at all), so a title
 * holding CR/LF cannot inject properties or components. Read back with ical.js (a reference
 * iCalendar parser). The API refuses such titles anyway (singleLine in shared/schemas/text.ts).
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { asc, eq } from 'drizzle-orm';
import ICAL from 'ical.js';
import { signedIn, testApp, type Browser, type TestApp } from '../support/app.js';
import { lessons, units } from '../../server/db/schema/index.js';

let t: TestApp;
let teacher: Browser;
let unitId = '';
let lessonId = '';

const INJECTED = 'Rovers\r\nEND:VCALENDAR\r\nBEGIN:VEVENT\r\nSUMMARY:Injected\r\nEND:VEVENT';
const PUNCTUATED = 'Gears; pulleys, and a back\\slash';

before(async () => {
  t = await testApp();
  teacher = await signedIn(t.app, 'teacher@kestrel-ridge.example');
  const [unit] = await t.database.db.select().from(units).where(eq(units.title, 'Rescue Rovers'));
  unitId = unit!.id;
  const [lesson] = await t.database.db
    .select({ id: lessons.id })
    .from(lessons)
    .where(eq(lessons.unitId, unitId))
    .orderBy(asc(lessons.position))
    .limit(1);
  lessonId = lesson!.id;
  // Written straight into the database, as data from before the API refused it would be.
  await t.database.db.update(units).set({ title: INJECTED }).where(eq(units.id, unitId));
  await t.database.db
    .update(lessons)
    .set({ title: PUNCTUATED, room: 'Room\u0007 4\nnext door' })
    .where(eq(lessons.id, lessonId));
});
after(async () => {
  await t.close();
});

/** Every physical line is a content line `NAME[;params]:value` or a folded continuation. */
function assertContentLines(text: string) {
  assert.ok(text.endsWith('\r\n'));
  const lines = text.slice(0, -2).split('\r\n');
  for (const line of lines) {
    // RFC 5545 §3.1: name is iana-token / x-name; a continuation starts with a space or tab.
    assert.match(line, /^([A-Z0-9-]+[;:]|[ \t])/, `content line: ${JSON.stringify(line)}`);
    // RFC 5545 §3.3.11: CONTROL characters (other than HTAB) are not allowed in TEXT.
    // eslint-disable-next-line no-control-regex
    assert.doesNotMatch(line, /[\u0000-\u0008\u000a-\u001f\u007f]/);
  }
  return lines;
}

for (const [what, url] of [
  ['unit', () => `/api/units/${unitId}/prep.ics`],
  ['lesson', () => `/api/lessons/${lessonId}/prep.ics`],
] as const) {
  describe(`GET the ${what} prep calendar with hostile titles`, () => {
    it('keeps them inside their properties, escaped per RFC 5545 §3.3.11', async () => {
      const res = await teacher.get(url());
      assert.equal(res.status, 200);
      const lines = assertContentLines(res.text);
      assert.equal(lines.filter((l) => l === 'BEGIN:VCALENDAR').length, 1);
      assert.equal(lines.filter((l) => l === 'END:VCALENDAR').length, 1);
      assert.equal(lines.at(-1), 'END:VCALENDAR');
      const calendar = new ICAL.Component(ICAL.parse(res.text));
      const events = calendar.getAllSubcomponents('vevent');
      assert.ok(events.length > 0);
      assert.ok(events.every((e) => e.getFirstPropertyValue('summary') !== 'Injected'));
      // The escaped line breaks read back as line breaks inside the one value. ical.js keeps
      // NAME (RFC 7986) and X-WR-CALNAME raw, so they are decoded with its TEXT decoder.
      const text = ICAL.design.icalendar.value['text']!;
      const decode = (prop: string) =>
        String(text.fromICAL!(String(calendar.getFirstPropertyValue(prop))));
      const name = decode('x-wr-calname');
      assert.ok(name.includes('Rovers\nEND:VCALENDAR\nBEGIN:VEVENT'), name);
      assert.equal(decode('name'), name);
      const unfolded = res.text.replace(/\r\n[ \t]/g, '');
      assert.match(unfolded, /\r\nNAME:Trayplan prep: Rovers\\nEND:VCALENDAR\\nBEGIN:VEVENT/);
      const mine = events.filter((e) =>
        String(e.getFirstPropertyValue('description')).includes(PUNCTUATED),
      );
      assert.ok(mine.length > 0, 'the punctuated lesson title reads back as it was');
      assert.match(unfolded, /Gears\\; pulleys\\, and a back\\\\slash/);
      assert.equal(String(mine[0]!.getFirstPropertyValue('location')), 'Room 4\nnext door');
    });
  });
}

describe('the API refuses control characters in single-line fields', () => {
  it('answers 400 naming the title and changes nothing', async () => {
    const before = await teacher.get(`/api/units/${unitId}`);
    const res = await teacher.patch(`/api/units/${unitId}`, {
      version: before.body.version,
      title: 'Rovers\r\nBEGIN:VEVENT',
    });
    assert.equal(res.status, 400);
    assert.deepEqual(
      res.body.error.details.map((d: { path: string }) => d.path),
      ['title'],
    );
    const after = await teacher.get(`/api/units/${unitId}`);
    assert.equal(after.body.version, before.body.version);
    assert.equal(after.body.title, INJECTED);
  });
});
