import type { CellSummary, CohortRef, SharedCellSummary } from '@/db/cells';

// Type-only imports: erased at build time, so no server code reaches the browser.
export type CellSummaryDto = CellSummary;
export type SharedCellDto = SharedCellSummary;
export type CohortRefDto = CohortRef;
export interface ShareOptionsDto {
  shares: CohortRef[];
  cohorts: (CohortRef & { memberCount: number })[];
}
export interface CsvRowErrorDto {
  row: number;
  column: string;
  message: string;
}
