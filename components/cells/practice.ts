/**
 * Where the cells list's "Practice" action leads: the recorded practice run page
 * (app/(signed-in)/runs/practice/[cellId]) on a cell the user owns. A student practises on
 * their own copy of a shared cell, so the owner's cell never collects students' runs.
 */
import type { SharedCellDto } from './types';

/** The recorded practice page of a cell. */
export function practiceHref(cellId: string): string {
  return `/runs/practice/${encodeURIComponent(cellId)}`;
}

/**
 * The practice target of a cell shared with the student: their copy's practice page, or
 * `copy-first` when no copy exists yet (the list makes the copy, then opens its practice page).
 */
export function sharedPracticeTarget(shared: Pick<SharedCellDto, 'myCopyId'>): { kind: 'link'; href: string } | { kind: 'copy-first' } {
  return shared.myCopyId ? { kind: 'link', href: practiceHref(shared.myCopyId) } : { kind: 'copy-first' };
}
