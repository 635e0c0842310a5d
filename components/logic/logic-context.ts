'use client';
/**
 * Stable actions for the canvas's node components. Passing them through context instead of
 * node data keeps node data unchanged between edits, so memoised nodes do not re-render.
 */
import { createContext, useContext } from 'react';

export type LogicActions = {
  /** Sets one parameter of a block (one undo step). */
  setParam(blockId: string, name: string, value: unknown): void;
  /** Whether the sheet may be edited here. */
  canEdit: boolean;
};

export const LogicActionsContext = createContext<LogicActions>({
  setParam: () => undefined,
  canEdit: false,
});

export function useLogicActions(): LogicActions {
  return useContext(LogicActionsContext);
}
