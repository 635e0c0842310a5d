/**
 * Instance presets: the block parameters an IEC 61131-10 document keeps as a function-block
 * instance's initial values (PT, PV, SPAN_MAP's spans), and how they are written and read.
 */
import type { BlockType } from '@/simulator/plc/catalogue';
import { formatTime, iecNumber, iecReal, parseBool, parseIecNumber, parseTime } from './iec-text';

/** Cellwright's function block for SPAN_MAP (declared in the document). */
export const SPAN_FB = 'CW_SPAN_MAP';
/** The same block's name in files exported before SPAN_MAP had its name; still read. */
export const LEGACY_SPAN_FB = 'CW_SCALE';

type MemberKind = 'time' | 'int' | 'real' | 'bool';
type Member = { member: string; param: string; kind: MemberKind; dflt: number | boolean; optional?: true };
/**
 * Parameters kept as instance initial values; `dflt` is the type's declared initial value.
 * An `optional` parameter left out of a block is left out of its instance, and an instance
 * without it gives a block without it (SPAN_MAP's raw span, which then comes from the analog
 * input it reads); its declared initial value, a 16-bit unsigned word's range, only stands
 * in where the function block is used on its own.
 */
const MEMBERS: Partial<Record<BlockType, Member[]>> = {
  TON: [{ member: 'PT', param: 'PT', kind: 'time', dflt: 0 }],
  TOF: [{ member: 'PT', param: 'PT', kind: 'time', dflt: 0 }],
  TP: [{ member: 'PT', param: 'PT', kind: 'time', dflt: 0 }],
  CTU: [{ member: 'PV', param: 'PV', kind: 'int', dflt: 0 }],
  CTD: [{ member: 'PV', param: 'PV', kind: 'int', dflt: 0 }],
  CTUD: [{ member: 'PV', param: 'PV', kind: 'int', dflt: 0 }],
  SPAN_MAP: [
    { member: 'IN_MIN', param: 'inMin', kind: 'real', dflt: 0, optional: true },
    { member: 'IN_MAX', param: 'inMax', kind: 'real', dflt: 65535, optional: true },
    { member: 'OUT_MIN', param: 'outMin', kind: 'real', dflt: 0 },
    { member: 'OUT_MAX', param: 'outMax', kind: 'real', dflt: 100 },
    { member: 'CLAMP', param: 'clamp', kind: 'bool', dflt: false },
  ],
};

/** Initial value text of one member. */
export function formatMember(kind: MemberKind, value: unknown): string {
  if (kind === 'time') return formatTime(value as number);
  if (kind === 'bool') return value ? 'TRUE' : 'FALSE';
  return kind === 'int' ? iecNumber(value as number) : iecReal(value as number);
}
export function parseMember(kind: MemberKind, text: string): number | boolean | undefined {
  if (kind === 'time') return parseTime(text);
  if (kind === 'bool') return parseBool(text);
  return parseIecNumber(text);
}

/** The instance members of a block type with presets, for declarations (also used by the ST writer). */
export function presetMembers(type: BlockType): readonly Member[] {
  return MEMBERS[type] ?? [];
}
