import { z } from 'zod';

/** Route params of /api/changeovers/[id]/**. */
export const changeoverIdParamSchema = z.object({ id: z.uuid() });

export const changeoverTitleSchema = z
  .string({ message: 'Give the changeover a title.' })
  .trim()
  .min(1, { message: 'Give the changeover a title.' })
  .max(120, { message: 'Use at most 120 characters.' });

export const changeoverDescriptionSchema = z
  .string()
  .trim()
  .max(4000, { message: 'Use at most 4,000 characters.' })
  .default('');

/**
 * Opening a changeover: the cell (one of the user's own), what changes and why, and the base
 * version — the one that runs today (the cell's latest when omitted).
 */
export const openChangeoverSchema = z.object({
  cellId: z.uuid({ message: 'Choose one of your cells.' }),
  title: changeoverTitleSchema,
  description: changeoverDescriptionSchema,
  baseVersion: z.number({ message: 'Choose the version that runs today.' }).int().min(1, { message: 'Choose the version that runs today.' }).optional(),
});
export type OpenChangeoverInput = z.input<typeof openChangeoverSchema>;

/** Editing a changeover before sign-off: title and description, and who is asked to countersign. */
export const updateChangeoverSchema = z
  .object({
    title: changeoverTitleSchema.optional(),
    description: changeoverDescriptionSchema.optional(),
    countersignerId: z.uuid({ message: 'Choose a person from the list.' }).nullable().optional(),
  })
  .refine((v) => v.title !== undefined || v.description !== undefined || v.countersignerId !== undefined, { message: 'Nothing to change.' });
export type UpdateChangeoverInput = z.input<typeof updateChangeoverSchema>;

/**
 * A signature or countersignature names the pin the person looked at: if the proposal was
 * re-pinned in between, the signature is refused (409) instead of landing on another document.
 */
export const signatureSchema = z.object({
  baseVersion: z.number().int().min(1),
  proposedVersion: z.number().int().min(1),
  /** Typed by the signer as a deliberate act: their own name as it appears on the account. */
  confirmName: z.string().trim().min(1, { message: 'Type your name to sign.' }).max(200),
});
export type SignatureInput = z.input<typeof signatureSchema>;

/** A rollback (or abandoning a proposal) is confirmed in a dialog; the body says which one the person saw. */
export const rollbackSchema = z.object({
  confirm: z.literal(true, { message: 'Confirm the rollback.' }),
});
