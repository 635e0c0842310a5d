/**
 * Demo cells shipped with Cellwright (invented scenarios). The app's seed imports them from
 * simulator/index.ts; the headless runner's examples are the same documents as JSON.
 */
import { pickAndPlaceCell, type CellDocumentInput } from './pick-and-place';
import { starterCell } from './starter';

export { pickAndPlaceCell, starterCell };
export { pickAndPlaceDebouncedSheet, PART_DEBOUNCE_MS } from './part-debounce';
/** A cell document as written (before defaults are applied). */
export type { CellDocumentInput };

/** Every demo cell, by document id. */
export const demoCells: Readonly<Record<string, CellDocumentInput>> = Object.freeze({
  [pickAndPlaceCell.id]: pickAndPlaceCell,
  [starterCell.id]: starterCell,
});
