'use client';
/**
 * Text being typed into a field that commits on blur: follows the committed `value` when it
 * changes from outside (undo, another area), otherwise keeps what the user is typing.
 * Adjusts during render, as React recommends for state derived from a prop.
 */
import { useState, type KeyboardEvent } from 'react';

export function useTextDraft(value: string): [string, (text: string) => void] {
  const [text, setText] = useState(value);
  const [seen, setSeen] = useState(value);
  if (seen !== value) {
    setSeen(value);
    setText(value);
  }
  return [text, setText];
}

/** `onKeyDown` for a draft field: Enter commits it the same way leaving it does (its blur). */
export function blurOnEnter(e: KeyboardEvent<HTMLInputElement>): void {
  if (e.key === 'Enter') (e.target as HTMLInputElement).blur();
}
