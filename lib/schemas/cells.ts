import { z } from 'zod';
import { CELL_TEMPLATES } from '@/lib/cells/template-names';

/** CSV files the cells routes read and write (docs/csv-formats.md). */
export const CSV_KINDS = ['point-map', 'io-list'] as const;
export type CsvKind = (typeof CSV_KINDS)[number];

/** Largest CSV text accepted in one import (characters); the row limits of the document apply too. */
export const MAX_CSV_CHARS = 1_000_000;

export const cellIdParamSchema = z.object({ id: z.uuid() });
export const cellVersionParamSchema = z.object({ id: z.uuid(), version: z.coerce.number().int().min(1).max(1_000_000) });
export const cellShareParamSchema = z.object({ id: z.uuid(), cohortId: z.uuid() });
export const cellCsvParamSchema = z.object({ id: z.uuid(), kind: z.enum(CSV_KINDS) });
export const csvTemplateParamSchema = z.object({ kind: z.enum(CSV_KINDS) });

export const cellNameSchema = z
  .string()
  .trim()
  .min(1, { message: 'Give the cell a name.' })
  .max(120, { message: 'Use at most 120 characters.' });

const messageSchema = z.string().trim().max(500, { message: 'Use at most 500 characters.' }).default('');
const baseVersionSchema = z.number({ message: 'The version your edit is based on is missing.' }).int().min(1);

export const createCellSchema = z.object({
  name: cellNameSchema,
  template: z.enum(CELL_TEMPLATES, { message: 'Choose a starting point.' }),
});
export type CreateCellInput = z.input<typeof createCellSchema>;

export const renameCellSchema = z.object({ name: cellNameSchema });
export const duplicateCellSchema = z.object({ name: cellNameSchema.optional() });

/** A save: the document is checked against the engine's schema by the handler (lib/cells/document.ts). */
export const saveVersionSchema = z.object({
  baseVersion: baseVersionSchema,
  document: z.unknown().refine((v) => v !== undefined && v !== null, { message: 'The cell document is missing.' }),
  message: messageSchema,
});
export type SaveVersionInput = z.input<typeof saveVersionSchema>;

/** A JSON import: the whole cell document as exported, optionally under another name. */
export const importCellSchema = z.object({
  name: cellNameSchema.optional(),
  document: z.unknown().refine((v) => v !== undefined && v !== null, { message: 'The cell document is missing.' }),
});

export const shareCellSchema = z.object({ cohortId: z.uuid({ message: 'Choose a cohort.' }) });

export const csvImportSchema = z.object({
  baseVersion: baseVersionSchema,
  csv: z.string().min(1, { message: 'The file is empty.' }).max(MAX_CSV_CHARS, { message: `The file is larger than ${MAX_CSV_CHARS} characters.` }),
  message: messageSchema,
});
export type CsvImportInput = z.input<typeof csvImportSchema>;

export const exportQuerySchema = z.object({ version: z.coerce.number().int().min(1).optional() });

/** A CSV export: a version (the latest when left out) and, for the point map, the live rows or the staged ones waiting for a restart. */
export const csvExportQuerySchema = exportQuerySchema.extend({ rows: z.enum(['live', 'staged']).default('live') });
