import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatCheckboxHarness } from '@angular/material/checkbox/testing';
import { MatSnackBarHarness } from '@angular/material/snack-bar/testing';
import type { PrepTick } from '../../../shared/schemas/prep-ticks';
import { errorBody, settleReads, testProviders } from '../testing/test-providers';
import { PrepTasks } from './prep-tasks';
import { workedExamplePlan } from './worked-example';

const URL = '/api/lessons/lesson-2/prep/ticks';
/** Ticked by the teaching partner earlier (an invented name). */
const PULL_TICK: PrepTick = {
  taskKey: 'pull',
  at: '2026-07-28T10:40:00+09:30',
  by: { id: 'user-partner', name: 'Jo Marsh' },
};

describe('PrepTasks', () => {
  let fixture: ComponentFixture<PrepTasks>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  function create(ticks: PrepTick[], canTick: boolean): void {
    TestBed.configureTestingModule({ providers: testProviders() });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PrepTasks);
    fixture.componentRef.setInput('lessonId', 'lesson-2');
    fixture.componentRef.setInput('lessonStartsAt', '2026-07-28T11:10');
    fixture.componentRef.setInput('tasks', workedExamplePlan().tasks);
    fixture.componentRef.setInput('ticks', ticks);
    fixture.componentRef.setInput('canTick', canTick);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
  }

  afterEach(() => backend.verify());

  const boxes = () => loader.getAllHarnesses(MatCheckboxHarness);
  const text = () => (fixture.nativeElement as HTMLElement).textContent!.replace(/\s+/g, ' ');

  it('shows the ticks the server holds (a reload or another teacher’s tick) and who ticked', async () => {
    create([PULL_TICK], true);
    const [charge, pull, devices] = await boxes();
    expect(await charge!.isChecked()).toBeFalse();
    expect(await pull!.isChecked()).toBeTrue();
    expect(await devices!.isChecked()).toBeFalse();
    expect(text()).toContain('Done by Jo Marsh');
  });

  it('clears a tick with one request and shows the server’s answer', async () => {
    create([PULL_TICK], true);
    const [, pull] = await boxes();
    const unchecked = pull!.uncheck();
    await settleReads();
    const req = backend.expectOne(URL);
    expect(req.request.body).toEqual({ taskKey: 'pull', done: false });
    req.flush({ ticks: [] });
    await unchecked;
    expect(await pull!.isChecked()).toBeFalse();
    expect(text()).not.toContain('Done by');
  });

  it('puts the box back when the save fails, and says why', async () => {
    create([], true);
    const [charge] = await boxes();
    const checked = charge!.check();
    await settleReads();
    backend
      .expectOne(URL)
      .flush(errorBody('forbidden', 'Only the lesson’s teachers can do this.'), {
        status: 403,
        statusText: 'Forbidden',
      });
    await checked;
    await fixture.whenStable();
    expect(await charge!.isChecked()).toBeFalse();
    const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    const bar = await root.getHarness(MatSnackBarHarness);
    expect(await bar.getMessage()).toContain('Only the lesson’s teachers');
  });

  it('shows the ticks read-only to a reader who does not run the lesson', async () => {
    create([PULL_TICK], false);
    for (const box of await boxes()) expect(await box.isDisabled()).toBeTrue();
    expect(await (await boxes())[1]!.isChecked()).toBeTrue();
  });
});
