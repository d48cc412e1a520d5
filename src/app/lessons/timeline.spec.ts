import { TestBed } from '@angular/core/testing';
import { Timeline } from './timeline';
import { workedExampleInput, workedExamplePlan } from './worked-example';

describe('Timeline', () => {
  function render(plan = workedExamplePlan()) {
    const fixture = TestBed.createComponent(Timeline);
    fixture.componentRef.setInput('timeline', plan.timeline);
    fixture.detectChanges();
    const el = fixture.nativeElement as HTMLElement;
    const segments = Array.from(el.querySelectorAll('.segment')).map((s) => ({
      times: s.querySelector('.times')!.textContent!.trim(),
      label: s.querySelector('.label')!.textContent!.trim(),
      overrun: s.classList.contains('overrun'),
      flagged: !!s.querySelector('.flag'),
    }));
    return { el, segments };
  }

  it('draws set out, activities and pack-away with clock times (PREP-RULES.md worked example)', () => {
    const { el, segments } = render();
    // Worked example: set out 5, build 25, code 15, pack-away 6 starting 11:54; 51 of 50 planned.
    expect(segments.map((s) => [s.label, s.times])).toEqual([
      ['Set out', '11:10 am–11:15 am'],
      ['Build the rover', '11:15 am–11:40 am'],
      ['Code the rover', '11:40 am–11:55 am'],
      ['Pack away', '11:54 am–12:00 pm'],
    ]);
    expect(el.textContent).toContain('Activities overrun by 1 min.');
    expect(el.querySelector('.kind-pack-away .marker')!.textContent).toContain('Starts 11:54 am');
  });

  it('flags only the activity that runs past the start of pack-away', () => {
    const { segments } = render();
    expect(segments.map((s) => s.flagged)).toEqual([false, false, true, false]);
    expect(segments[2].overrun).toBeTrue();
  });

  it('adds a buffer segment for the slack when the activities fit', () => {
    const input = workedExampleInput();
    input.activities[1] = { ...input.activities[1], minutes: 5 };
    const { el, segments } = render(workedExamplePlan({ activities: input.activities }));
    // R8: planned 5 + 25 + 5 + 6 = 41 of 50 → 9 min of buffer from 11:45 to 11:54.
    expect(segments.map((s) => [s.label, s.times])).toEqual([
      ['Set out', '11:10 am–11:15 am'],
      ['Build the rover', '11:15 am–11:40 am'],
      ['Code the rover', '11:40 am–11:45 am'],
      ['Buffer', '11:45 am–11:54 am'],
      ['Pack away', '11:54 am–12:00 pm'],
    ]);
    expect(segments.some((s) => s.flagged)).toBeFalse();
    expect(el.textContent).toContain('9 min to spare.');
  });
});
