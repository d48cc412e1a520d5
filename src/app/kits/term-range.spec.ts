import { dayAfter, termThatMatters } from './term-range';

const TERMS = [
  { name: 'Term 3', startsOn: '2026-07-20', endsOn: '2026-09-25' },
  { name: 'Term 1', startsOn: '2026-01-27', endsOn: '2026-04-10' },
  { name: 'Term 4', startsOn: '2026-10-12', endsOn: '2026-12-11' },
  { name: 'Term 2', startsOn: '2026-04-27', endsOn: '2026-07-03' },
];

describe('termThatMatters', () => {
  it('is the term around today, its first and last days included', () => {
    expect(termThatMatters(TERMS, '2026-08-14')?.name).toBe('Term 3');
    expect(termThatMatters(TERMS, '2026-07-20')?.name).toBe('Term 3');
    expect(termThatMatters(TERMS, '2026-09-25')?.name).toBe('Term 3');
  });

  it('in the holidays is the next term to start, not the one just ended', () => {
    expect(termThatMatters(TERMS, '2026-09-30')?.name).toBe('Term 4');
    expect(termThatMatters(TERMS, '2026-01-02')?.name).toBe('Term 1');
  });

  it('is null after the last term', () => {
    expect(termThatMatters(TERMS, '2026-12-20')).toBeNull();
  });
});

describe('dayAfter', () => {
  it('crosses month and year ends (proleptic Gregorian calendar, ISO 8601)', () => {
    expect(dayAfter('2026-09-25')).toBe('2026-09-26');
    expect(dayAfter('2026-09-30')).toBe('2026-10-01');
    expect(dayAfter('2026-12-31')).toBe('2027-01-01');
    expect(dayAfter('2028-02-28')).toBe('2028-02-29');
  });
});
