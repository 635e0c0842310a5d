import 'server-only';
import { ApiError } from '@/lib/api/errors';
import type { User } from '@/db/users';
import { findUserById } from '@/db/users';
import { cellForOwner } from '@/lib/cells/access';
import type { OpenChangeoverInput, UpdateChangeoverInput } from '@/lib/schemas/changeovers';
import type { Changeover, ChangeoverState } from './types';
import {
  findChangeover,
  openChangeover as insertChangeover,
  pinProposal,
  rollBackChangeover,
  setCountersigner,
  unpinProposal,
  updateChangeoverText,
} from '@/db/changeovers';
import { ROLE_TABLE } from '@/lib/roles';

/** The state a changeover is in, in the words the pages use (also in 409 messages). */
const STATE_WORDS: Record<ChangeoverState, string> = {
  drafting: 'still drafting',
  checked: 'under check',
  'signed-off': 'signed off',
  'rolled-back': 'rolled back',
  withdrawn: 'abandoned',
};

export function stateConflict(state: ChangeoverState, wanted: string): ApiError {
  return new ApiError(409, `This changeover is ${STATE_WORDS[state]}: ${wanted}`, undefined, { body: { state } });
}

/** Opens a changeover on one of the user's own cells; the base is the latest version unless named. */
export async function openChangeoverFor(user: User, input: OpenChangeoverInput & { description: string }): Promise<Changeover> {
  const cell = await cellForOwner(user, input.cellId).catch((e: unknown) => {
    // The cell is a field of the form: a cell that is not theirs is a field error, not a missing page.
    if (e instanceof ApiError && (e.status === 404 || e.status === 403)) {
      throw new ApiError(422, 'Some fields are not valid.', { cellId: ['Choose one of your own cells.'] });
    }
    throw e;
  });
  const made = await insertChangeover({
    cellId: cell.id,
    openedBy: user.id,
    title: input.title,
    description: input.description,
    baseVersion: input.baseVersion ?? cell.latestVersion,
  });
  if (!made.ok) {
    throw new ApiError(422, 'Some fields are not valid.', { baseVersion: [`The cell has versions 1 to ${made.latestVersion}.`] });
  }
  return made.changeover;
}

/** Title, description and countersigner, while the changeover is drafting or under check. */
export async function updateChangeoverFor(user: User, co: Changeover, input: UpdateChangeoverInput): Promise<Changeover> {
  if (co.state !== 'drafting' && co.state !== 'checked') throw stateConflict(co.state, 'its record no longer changes.');
  if (input.title !== undefined || input.description !== undefined) {
    await updateChangeoverText(co.id, user.id, { title: input.title ?? co.title, description: input.description ?? co.description });
  }
  if (input.countersignerId !== undefined) {
    if (input.countersignerId === null) {
      await setCountersigner(co.id, user.id, null);
    } else {
      const person = await findUserById(input.countersignerId);
      const fits = person && !person.disabled && ROLE_TABLE.countersign.includes(person.role) && person.id !== user.id && person.id !== co.signedBy?.id;
      if (!person || !fits) {
        throw new ApiError(422, 'Some fields are not valid.', {
          countersignerId: ['Ask another lead, a trainer or the administrator — not yourself.'],
        });
      }
      await setCountersigner(co.id, user.id, { id: person.id, name: person.name });
    }
  }
  return (await findChangeover(co.id))!;
}

/** Pins the proposal (drafting → under check); 409 when there is nothing to pin or the changeover is closed. */
export async function pinChangeover(user: User, co: Changeover): Promise<Changeover> {
  const r = await pinProposal(co.id, user.id);
  if (!r.ok) {
    if (r.reason === 'missing') throw new ApiError(404, 'No such changeover.');
    if (r.reason === 'unchanged') {
      throw new ApiError(409, `Nothing to check yet: the cell's latest version is still the base (version ${co.baseVersion}). Edit the proposal in the workspace first.`);
    }
    throw stateConflict(r.state, 'it cannot be pinned again.');
  }
  return (await findChangeover(co.id))!;
}

/** Back to drafting: drops the pin and any waiting signature. */
export async function unpinChangeover(user: User, co: Changeover): Promise<Changeover> {
  const r = await unpinProposal(co.id, user.id);
  if (!r.ok) {
    if (r.reason === 'missing') throw new ApiError(404, 'No such changeover.');
    throw stateConflict(r.state, 'it cannot go back to drafting.');
  }
  return (await findChangeover(co.id))!;
}

/**
 * Rollback. After sign-off, it puts the base back as the cell's current version (the change
 * went wrong on the floor). Before sign-off, the same act abandons the proposal: the cell
 * returns to the version that runs today, so an unapproved edit never stays the latest.
 */
export async function rollBackFor(user: User, co: Changeover): Promise<{ changeover: Changeover; version: number }> {
  const r = await rollBackChangeover(co.id, user.id);
  if (!r.ok) {
    if (r.reason === 'missing') throw new ApiError(404, 'No such changeover.');
    if (r.reason === 'cell-gone') throw new ApiError(409, 'The cell of this changeover has been deleted: there is nothing to roll back.');
    throw stateConflict(r.state, 'there is nothing left to roll back.');
  }
  return { changeover: (await findChangeover(co.id))!, version: r.version };
}
