import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideMarkdown } from 'ngx-markdown';
import type { Unit } from '../../../shared/schemas/units';
import { testProviders } from '../testing/test-providers';
import { UnitDetail } from './unit-detail';

/** An invented unit of the invented demo school. */
const UNIT: Unit = {
  id: 'u-1',
  title: 'Rescue Rovers',
  yearLevel: 4,
  learningArea: 'Digital Technologies',
  term: 3,
  status: 'draft',
  visibility: 'school',
  owner: { id: 'user-teacher', name: 'Jordan Pell', email: 'teacher@kestrel-ridge.example' },
  version: 2,
  updatedAt: '2026-07-20T09:00:00+09:30',
  canEdit: true,
  overview: '## Why rovers\n\nStudents **build** a rover.<script>window.hacked = true</script>',
  copiedFromId: null,
  createdAt: '2026-07-01T09:00:00+09:30',
  coauthors: [],
  outcomes: [
    { id: 'o1', code: 'DT4-02', description: 'Follow and describe steps.', frameworkId: 'f', strand: 'Processes', yearBand: '3–4' },
  ],
  lessons: [
    { id: 'l-1', title: 'Meet the rover', date: '2026-07-21', startsAt: '2026-07-21T11:10', endsAt: '2026-07-21T12:00', classId: 'c', className: '4K' },
    { id: 'l-2', title: 'Drive train', date: '2026-07-28', startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T12:00', classId: 'c', className: '4K' },
  ],
  isOwner: true,
};

describe('UnitDetail', () => {
  it('renders the overview as sanitised Markdown, the outcomes and the lessons in order', async () => {
    TestBed.configureTestingModule({ providers: [testProviders(), provideMarkdown()] });
    const backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(UnitDetail);
    fixture.componentRef.setInput('id', 'u-1');
    fixture.detectChanges();
    backend.expectOne('/api/units/u-1').flush(UNIT);
    await fixture.whenStable();
    await new Promise((resolve) => setTimeout(resolve, 50));
    fixture.detectChanges();
    const el = fixture.nativeElement as HTMLElement;
    expect(el.querySelector('.overview h2')?.textContent).toBe('Why rovers');
    expect(el.querySelector('.overview strong')?.textContent).toBe('build');
    expect(el.querySelector('.overview script')).toBeNull();
    expect((window as unknown as { hacked?: boolean }).hacked).toBeUndefined();
    expect(el.textContent).toContain('DT4-02');
    const links = Array.from(el.querySelectorAll('.lessons a')).map((a) => [
      a.textContent,
      a.getAttribute('href'),
    ]);
    expect(links).toEqual([
      ['Meet the rover', '/lessons/l-1'],
      ['Drive train', '/lessons/l-2'],
    ]);
    expect(el.textContent).toContain('Tue 28 Jul 2026, 11:10 am–12:00 pm');
    backend.verify();
  });
});
