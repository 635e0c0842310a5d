import type { CellDocument } from '@/simulator';

export type DeviceColour = CellDocument['panel'][number]['colour'];

/**
 * Device colours and the meaning IEC 60204-1 §10.2.1 (push buttons) and §10.3.2 (indicator
 * lights) / IEC 60073 give them, for the edit form's hints and the screen-reader label.
 */
export const COLOUR_MEANING: Record<DeviceColour, string> = {
  red: 'emergency / stop',
  yellow: 'abnormal',
  green: 'normal / start',
  blue: 'mandatory action',
  white: 'no specific meaning',
  grey: 'no specific meaning',
  black: 'no specific meaning',
};

/** Cap and body fills: `lit` is the brighter face of a lamp that is on. */
export const CAP: Record<DeviceColour, { off: string; lit: string; text: string }> = {
  red: { off: 'bg-red-800', lit: 'bg-red-500', text: 'text-white' },
  yellow: { off: 'bg-yellow-700', lit: 'bg-yellow-300', text: 'text-slate-900' },
  green: { off: 'bg-green-800', lit: 'bg-green-400', text: 'text-white' },
  blue: { off: 'bg-blue-800', lit: 'bg-blue-400', text: 'text-white' },
  white: { off: 'bg-slate-300', lit: 'bg-white', text: 'text-slate-900' },
  grey: { off: 'bg-slate-500', lit: 'bg-slate-300', text: 'text-slate-900' },
  black: { off: 'bg-slate-900', lit: 'bg-slate-700', text: 'text-white' },
};

/** The colours the edit form offers. */
export const COLOURS = Object.keys(COLOUR_MEANING) as DeviceColour[];

/** What a button does, as the document names it; the engine checks its colour (IEC 60204-1 §10.2.1). */
export type ButtonFunction = NonNullable<Extract<CellDocument['panel'][number], { type: 'push-button' }>['function']>;
/** The functions the edit form offers. */
export const BUTTON_FUNCTIONS: readonly ButtonFunction[] = ['start', 'stop', 'reset', 'start-stop', 'other'];
