import { FormArray, FormControl, FormGroup, type ValidatorFn } from '@angular/forms';
import {
  DEFAULT_PREP,
  type PaperSize,
  type PrepAllowances,
  type SchoolSettings,
  type SchoolSettingsUpdate,
} from '../../../shared/schemas/school';

export type PrepKey = keyof PrepAllowances;

/** The prep allowances in the order the form shows them, with a label, unit and hint each. */
export const PREP_FIELDS: readonly { key: PrepKey; label: string; unit: string; hint: string }[] = [
  {
    key: 'setOutMinutes',
    label: 'Set-out time',
    unit: 'minutes',
    hint: 'Kept at the start of every lesson for handing out tubs and trays.',
  },
  {
    key: 'packAwayBaseMinutes',
    label: 'Pack-away, fixed part',
    unit: 'minutes',
    hint: 'Kept at the end of every lesson for packing away, however small the build.',
  },
  {
    key: 'packAwaySecondsPerPiece',
    label: 'Pack-away, per piece',
    unit: 'seconds',
    hint: 'Added to pack-away for each piece the busiest group has out.',
  },
  {
    key: 'pullBaseMinutes',
    label: 'Pull list, fixed part',
    unit: 'minutes',
    hint: 'Time to start pulling parts for a lesson before counting any.',
  },
  {
    key: 'pullSecondsPerLine',
    label: 'Pull list, per line',
    unit: 'seconds',
    hint: 'Added for each line of the pull list (finding the right compartment).',
  },
  {
    key: 'pullSecondsPerPiece',
    label: 'Pull list, per piece',
    unit: 'seconds',
    hint: 'Added for each piece counted out.',
  },
  {
    key: 'sparesPercent',
    label: 'Spares',
    unit: 'percent',
    hint: 'Extra small parts put in the spares tray, as a share of what the class needs (0 to 50).',
  },
  {
    key: 'chargeBufferMinutes',
    label: 'Charging buffer',
    unit: 'minutes',
    hint: 'Controllers should be fully charged this long before the lesson starts.',
  },
  {
    key: 'sortMinutesPerTub',
    label: 'Sorting, per tub',
    unit: 'minutes',
    hint: 'Time to sort and count a tub that needs sorting before it is used.',
  },
  {
    key: 'deviceCheckMinutesPerDevice',
    label: 'Device check, per device',
    unit: 'minutes',
    hint: 'Time to check each device (charged, signed in) before a coding lesson.',
  },
];

export type TermForm = FormGroup<{
  id: FormControl<string>;
  name: FormControl<string>;
  startsOn: FormControl<string>;
  endsOn: FormControl<string>;
}>;
export type PeriodForm = FormGroup<{
  id: FormControl<string>;
  name: FormControl<string>;
  startsAt: FormControl<string>;
  endsAt: FormControl<string>;
}>;
export type DayForm = FormGroup<{
  id: FormControl<string>;
  date: FormControl<string>;
  reason: FormControl<string>;
}>;
export type PrepForm = FormGroup<{ [K in PrepKey]: FormControl<number | null> }>;
export type SettingsForm = FormGroup<{
  name: FormControl<string>;
  timezone: FormControl<string>;
  paperSize: FormControl<PaperSize>;
  prep: PrepForm;
  terms: FormArray<TermForm>;
  periods: FormArray<PeriodForm>;
  nonTeachingDays: FormArray<DayForm>;
}>;
export type SettingsRaw = ReturnType<SettingsForm['getRawValue']>;
/** The body of PUT /api/school without its version. */
export type SettingsBody = Omit<SchoolSettingsUpdate, 'version'>;

/** Builds form controls, each with the one validator of the form's SchemaIssues. */
export class SettingsFormBuilder {
  constructor(private readonly validator: ValidatorFn) {}

  private text(value = ''): FormControl<string> {
    return new FormControl(value, { nonNullable: true, validators: [this.validator] });
  }

  form(): SettingsForm {
    const v = [this.validator];
    const prep = Object.fromEntries(
      PREP_FIELDS.map((f) => [f.key, new FormControl<number | null>(DEFAULT_PREP[f.key], v)]),
    ) as PrepForm['controls'];
    return new FormGroup({
      name: this.text(),
      timezone: this.text(),
      paperSize: new FormControl<PaperSize>('A4', { nonNullable: true, validators: v }),
      prep: new FormGroup(prep, v),
      terms: new FormArray<TermForm>([], v),
      periods: new FormArray<PeriodForm>([], v),
      nonTeachingDays: new FormArray<DayForm>([], v),
    });
  }

  term(t: Partial<SchoolSettings['terms'][number]> = {}): TermForm {
    return new FormGroup(
      {
        id: this.text(t.id),
        name: this.text(t.name),
        startsOn: this.text(t.startsOn),
        endsOn: this.text(t.endsOn),
      },
      [this.validator],
    );
  }

  period(p: Partial<SchoolSettings['periods'][number]> = {}): PeriodForm {
    return new FormGroup(
      {
        id: this.text(p.id),
        name: this.text(p.name),
        startsAt: this.text(p.startsAt),
        endsAt: this.text(p.endsAt),
      },
      [this.validator],
    );
  }

  day(d: Partial<SchoolSettings['nonTeachingDays'][number]> = {}): DayForm {
    return new FormGroup(
      { id: this.text(d.id), date: this.text(d.date), reason: this.text(d.reason) },
      [this.validator],
    );
  }

  /**
   * Puts `s` into `form`, rows and all. Existing row groups are kept and refilled, so the page
   * does not rebuild every row after a save.
   */
  fill(form: SettingsForm, s: SchoolSettings | SettingsBody): void {
    const c = form.controls;
    resize(c.terms, s.terms?.length ?? 0, () => this.term());
    resize(c.periods, s.periods?.length ?? 0, () => this.period());
    resize(c.nonTeachingDays, s.nonTeachingDays?.length ?? 0, () => this.day());
    form.setValue({
      name: s.name,
      timezone: s.timezone,
      paperSize: s.paperSize,
      prep: { ...DEFAULT_PREP, ...s.prep },
      terms: (s.terms ?? []).map((t) => ({ id: t.id ?? '', ...pickTerm(t) })),
      periods: (s.periods ?? []).map((p) => ({
        id: p.id ?? '',
        name: p.name,
        startsAt: p.startsAt,
        endsAt: p.endsAt,
      })),
      nonTeachingDays: (s.nonTeachingDays ?? []).map((d) => ({
        id: d.id ?? '',
        date: d.date,
        reason: d.reason ?? '',
      })),
    });
  }
}

function pickTerm(t: { name: string; startsOn: string; endsOn: string }) {
  return { name: t.name, startsOn: t.startsOn, endsOn: t.endsOn };
}

/** Adds or removes rows at the end until `array` has `length` rows. */
function resize<T extends FormGroup>(array: FormArray<T>, length: number, make: () => T): void {
  while (array.length > length) array.removeAt(array.length - 1, { emitEvent: false });
  while (array.length < length) array.push(make(), { emitEvent: false });
}

/** The form's raw value as the request body; a row without an id is a new row. */
export function toBody(raw: SettingsRaw): SettingsBody {
  const id = (value: string) => (value ? { id: value } : {});
  return {
    name: raw.name,
    timezone: raw.timezone,
    paperSize: raw.paperSize,
    // Blank number fields stay null so the schema says what to enter; a valid form has none.
    prep: Object.fromEntries(PREP_FIELDS.map((f) => [f.key, raw.prep[f.key]])) as PrepAllowances,
    terms: raw.terms.map((t) => ({
      ...id(t.id),
      name: t.name,
      startsOn: t.startsOn,
      endsOn: t.endsOn,
    })),
    periods: raw.periods.map((p) => ({
      ...id(p.id),
      name: p.name,
      startsAt: p.startsAt,
      endsAt: p.endsAt,
    })),
    nonTeachingDays: raw.nonTeachingDays.map((d) => ({
      ...id(d.id),
      date: d.date,
      reason: d.reason,
    })),
  };
}

/** Saved settings as a body in the same shape toBody gives, so the two compare as JSON. */
export function settingsBody(s: SchoolSettings): SettingsBody {
  return toBody({
    name: s.name,
    timezone: s.timezone,
    paperSize: s.paperSize,
    prep: { ...s.prep },
    terms: s.terms.map((t) => ({ ...t })),
    periods: s.periods.map((p) => ({ ...p })),
    nonTeachingDays: s.nonTeachingDays.map((d) => ({ ...d })),
  });
}

const SECTION_LABELS: Record<Exclude<keyof SettingsBody, 'prep'>, string> = {
  name: 'the school name',
  timezone: 'the time zone',
  paperSize: 'the paper size',
  terms: 'the terms',
  periods: 'the bell times',
  nonTeachingDays: 'the non-teaching days',
};
const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

/** What differs between two versions of the settings, in words ("the terms", "spares"). */
export function changedParts(before: SettingsBody, after: SettingsBody): string[] {
  const parts: string[] = [];
  for (const key of Object.keys(SECTION_LABELS) as (keyof typeof SECTION_LABELS)[]) {
    if (!same(before[key], after[key])) parts.push(SECTION_LABELS[key]);
  }
  for (const f of PREP_FIELDS) {
    if (before.prep?.[f.key] !== after.prep?.[f.key]) parts.push(f.label.toLowerCase());
  }
  return parts;
}

/**
 * My change laid over what is saved now: each part I changed since `base` (a field, a whole list,
 * one prep allowance) takes my value, every other part keeps the saved one.
 */
export function reapply(base: SettingsBody, mine: SettingsBody, now: SettingsBody): SettingsBody {
  const pick = <K extends keyof SettingsBody>(key: K): SettingsBody[K] =>
    same(mine[key], base[key]) ? now[key] : mine[key];
  const prep = { ...DEFAULT_PREP, ...now.prep };
  for (const f of PREP_FIELDS) {
    if (mine.prep?.[f.key] !== base.prep?.[f.key]) prep[f.key] = mine.prep?.[f.key] as number;
  }
  return {
    name: pick('name'),
    timezone: pick('timezone'),
    paperSize: pick('paperSize'),
    prep,
    terms: pick('terms'),
    periods: pick('periods'),
    nonTeachingDays: pick('nonTeachingDays'),
  };
}

/** Joins ["a", "b", "c"] as "a, b and c". */
export function listInWords(items: readonly string[]): string {
  if (items.length <= 1) return items[0] ?? '';
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}
