/**
 * Changeover diff: the structural diff of a base and a proposed cell document, and the
 * I/O-list change sheet electricians work from. Pure; the `diff` CLI command is in ./cli.ts.
 */
export type {
  CellDiff,
  DiffArea,
  DiffKind,
  DiffTarget,
  DiffEntry,
  DiffSummary,
  AreaCounts,
  FieldChange,
  WireEndChange,
  RoleBinding,
} from './types';
export { DIFF_AREAS, DIFF_KINDS, DIFF_FORMAT_VERSION } from './types';
export { diffCells } from './diff-cell';
export type { IoChangeAction, IoChangeRow, IoChangeSheet } from './io-sheet';
export { ioChangeSheet, ioChangeCsv, neutraliseCsvCell, IO_CHANGE_COLUMNS } from './io-sheet';
