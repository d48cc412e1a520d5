import {
  UNIT_STATUS_LABELS,
  type Unit,
  type UnitUpdate,
  type UnitVisibility,
} from '../../../shared/schemas/units';
import { yearLabel } from './labels';

/** What the editor's form holds; outcomes keep their codes for the chips. */
export interface UnitDraft {
  title: string;
  yearLevel: number | null;
  learningArea: string;
  term: number | null;
  overview: string;
  visibility: UnitVisibility;
  outcomeIds: readonly string[];
  coauthorIds: readonly string[];
}

/** The fields of `PATCH /api/units/:id` besides the version. */
export type UnitChange = Omit<UnitUpdate, 'version'>;

/** The form's starting values for a unit. */
export function draftOf(unit: Unit): UnitDraft {
  return {
    title: unit.title,
    yearLevel: unit.yearLevel,
    learningArea: unit.learningArea,
    term: unit.term,
    overview: unit.overview,
    visibility: unit.visibility,
    outcomeIds: unit.outcomes.map((o) => o.id),
    coauthorIds: unit.coauthors.map((p) => p.id),
  };
}

function sameSet(a: readonly string[], b: readonly string[]): boolean {
  return a.length === b.length && a.every((id) => b.includes(id));
}

function sameList(a: readonly string[], b: readonly string[]): boolean {
  return a.length === b.length && a.every((id, i) => b[i] === id);
}

/**
 * Only the fields the person changed against `base` (the unit as loaded), trimmed as the server
 * trims them, so a save never sends (and so never overwrites) a field nobody touched.
 */
export function changedFields(base: Unit, draft: UnitDraft): UnitChange {
  const was = draftOf(base);
  const change: UnitChange = {};
  if (draft.title.trim() !== was.title) change.title = draft.title.trim();
  if (draft.yearLevel !== null && draft.yearLevel !== was.yearLevel)
    change.yearLevel = draft.yearLevel;
  if (draft.learningArea.trim() !== was.learningArea)
    change.learningArea = draft.learningArea.trim();
  if (draft.term !== was.term) change.term = draft.term;
  if (draft.overview !== was.overview) change.overview = draft.overview;
  if (draft.visibility !== was.visibility) change.visibility = draft.visibility;
  // Outcomes are a set; co-authors too (the server compares them as members).
  if (!sameSet(draft.outcomeIds, was.outcomeIds)) change.outcomeIds = [...draft.outcomeIds];
  if (!sameSet(draft.coauthorIds, was.coauthorIds)) change.coauthorIds = [...draft.coauthorIds];
  return change;
}

const VISIBILITY_WORDS: Record<UnitVisibility, string> = {
  private: 'private',
  school: 'shared with the school',
};

function people(unit: Unit): string {
  return unit.coauthors.map((p) => p.name || p.email).join(', ') || 'none';
}

/**
 * What someone else changed between `mine` (the unit as this person loaded it) and `theirs`
 * (`error.current` of a 409), in sentences a teacher reads.
 */
export function describeChanges(mine: Unit, theirs: Unit): string[] {
  const out: string[] = [];
  if (mine.title !== theirs.title) out.push(`The title is now “${theirs.title}”.`);
  if (mine.yearLevel !== theirs.yearLevel)
    out.push(`The year level is now ${yearLabel(theirs.yearLevel)}.`);
  if (mine.learningArea !== theirs.learningArea)
    out.push(`The learning area is now “${theirs.learningArea || 'none'}”.`);
  if (mine.term !== theirs.term)
    out.push(`The term is now ${theirs.term === null ? 'none' : `Term ${theirs.term}`}.`);
  if (mine.overview !== theirs.overview) out.push('The overview was changed.');
  if (mine.visibility !== theirs.visibility)
    out.push(`The unit is now ${VISIBILITY_WORDS[theirs.visibility]}.`);
  if (mine.status !== theirs.status)
    out.push(`The status is now ${UNIT_STATUS_LABELS[theirs.status]}.`);
  const mineOutcomes = mine.outcomes.map((o) => o.id);
  const theirOutcomes = theirs.outcomes.map((o) => o.id);
  if (!sameSet(mineOutcomes, theirOutcomes)) {
    const codes = theirs.outcomes.map((o) => o.code).join(', ') || 'none';
    out.push(`The outcomes are now: ${codes}.`);
  }
  if (
    !sameSet(
      mine.coauthors.map((p) => p.id),
      theirs.coauthors.map((p) => p.id),
    )
  )
    out.push(`The co-authors are now: ${people(theirs)}.`);
  const mineLessons = mine.lessons.map((l) => l.id);
  const theirLessons = theirs.lessons.map((l) => l.id);
  if (!sameSet(mineLessons, theirLessons)) out.push('Lessons were added or removed.');
  else if (!sameList(mineLessons, theirLessons)) out.push('The lessons were put in a new order.');
  if (!out.length) out.push('A change was saved that this page does not show.');
  return out;
}
