/**
 * JSON Schema (draft 2020-12) of the file formats, generated from the zod schemas so the two
 * cannot drift. Refinements that JSON Schema cannot express (cross-references, address
 * syntax checks) are enforced only by `validateCellDocument`.
 */
import { z } from 'zod';
import { cellDocumentSchema, eventLogSchema, faultCardSchema, rulesSchema } from '@/simulator';

/** JSON Schemas of the cell document, event log, rules file and fault card, by file stem. */
export function cellJsonSchemas(): Record<'cell' | 'events' | 'rules' | 'fault-card', unknown> {
  const opts = { io: 'input', unrepresentable: 'any' } as const;
  return {
    cell: z.toJSONSchema(cellDocumentSchema, opts),
    events: z.toJSONSchema(eventLogSchema, opts),
    rules: z.toJSONSchema(rulesSchema, opts),
    'fault-card': z.toJSONSchema(faultCardSchema, opts),
  };
}
