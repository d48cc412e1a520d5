import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { PrepSegment, PrepTimeline } from '../../../shared/prep/index';
import { ScrollRegion } from '../a11y/scroll-region';
import { clockTime } from './clock';

const KIND_LABELS: Record<PrepSegment['kind'], string> = {
  'set-out': 'Set out',
  activity: 'Activity',
  buffer: 'Spare time',
  'pack-away': 'Pack away',
};

/**
 * The lesson's timeline as one horizontal bar: each segment as wide as its minutes, with its
 * clock times; the start of pack-away marked on its segment's edge, and overrunning activities flagged in
 * words as well as by their border (colour is never the only cue, WCAG 2.2 SC 1.4.1).
 */
@Component({
  selector: 'app-timeline',
  imports: [ScrollRegion],
  template: `
    @let t = timeline();
    <p class="summary">
      {{ t.plannedMinutes }} of {{ t.windowMinutes }} minutes planned.
      @if (t.slackMinutes < 0) {
        <strong class="overrun-text">Activities overrun by {{ -t.slackMinutes }} min.</strong>
      } @else if (t.slackMinutes > 0) {
        {{ t.slackMinutes }} min to spare.
      }
      Pack-away starts at <strong>{{ clock(t.packAwayStartsAt) }}</strong> ({{ t.packAwayMinutes }}
      min).
    </p>
    <!-- A bar of time needs its two dimensions (WCAG 2.2 SC 1.4.10's exception): where it is wider
         than the page it scrolls sideways, as a named region the keyboard reaches. -->
    <div class="bar-wrap" appScrollRegion="Lesson timeline (scrolls sideways)">
      <ol class="bar" aria-label="Lesson timeline">
        @for (segment of t.segments; track $index) {
          <li
            class="segment"
            [class]="'segment kind-' + segment.kind"
            [class.overrun]="segment.overrun"
            [style.flex-grow]="segment.minutes || 0.5"
          >
            <span class="times">{{ clock(segment.startsAt) }}–{{ clock(segment.endsAt) }}</span>
            <span class="label">{{ segment.label }}</span>
            <span class="minutes">
              {{ segment.minutes }} min
              <span class="visually-hidden">({{ kindLabel(segment) }})</span>
            </span>
            @if (segment.kind === 'pack-away') {
              <span class="marker">Starts {{ clock(t.packAwayStartsAt) }}</span>
            }
            @if (segment.overrun) {
              <span class="flag">Runs into pack-away</span>
            }
          </li>
        }
      </ol>
    </div>
  `,
  styleUrl: './timeline.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Timeline {
  readonly timeline = input.required<PrepTimeline>();

  protected clock(value: string): string {
    return clockTime(value);
  }

  protected kindLabel(segment: PrepSegment): string {
    return KIND_LABELS[segment.kind];
  }
}
