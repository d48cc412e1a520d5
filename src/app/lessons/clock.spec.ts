import { clockOn, clockTime, dayLabel } from './clock';
import { groupSizeFor } from './group-size';

describe('clock', () => {
  it('shows 12-hour wall-clock times from the text, whatever the browser’s timezone', () => {
    // PREP-RULES.md R9: a three-hour charge for an 11:10 lesson, buffer 15, starts by 07:55.
    expect(clockTime('2026-07-28T07:55:00+09:30')).toBe('7:55 am');
    expect(clockTime('2026-07-28T12:00:00+09:30')).toBe('12:00 pm');
    expect(clockTime('2026-07-28T00:05')).toBe('12:05 am');
    expect(clockTime('2026-07-28T13:40')).toBe('1:40 pm');
  });

  it('names the weekday of a date', () => {
    // Weekdays checked against Python's datetime.date(2026, 7, 28).strftime('%a') → 'Tue'.
    expect(dayLabel('2026-07-28T11:10')).toBe('Tue 28 Jul 2026');
    expect(dayLabel('2026-07-27T09:00')).toBe('Mon 27 Jul 2026');
  });

  it('adds the day when a task falls on an earlier day than the lesson', () => {
    expect(clockOn('2026-07-28T07:55:00+09:30', '2026-07-28T11:10')).toBe('7:55 am');
    expect(clockOn('2026-07-27T23:10:00+09:30', '2026-07-28T08:30')).toBe('Mon 27 Jul, 11:10 pm');
  });
});

describe('groupSizeFor', () => {
  it('finds the smallest group size giving the asked number of groups (R1: n = ceil(S / g))', () => {
    // PREP-RULES.md R1: 27 students in groups of 4 → 7 groups (and groups of 3 would give 9).
    expect(groupSizeFor(27, 7)).toBe(4);
    // Worked example: 10 students, 2 groups → 5.
    expect(groupSizeFor(10, 2)).toBe(5);
    expect(groupSizeFor(10, 4)).toBe(3);
  });

  it('answers null when no size from 1 to 8 gives exactly that many groups', () => {
    // ceil(10 / 1) = 10, ceil(10 / 2) = 5: nothing gives 6; 60 students need at least 8 groups.
    expect(groupSizeFor(10, 6)).toBeNull();
    expect(groupSizeFor(60, 7)).toBeNull();
  });
});
