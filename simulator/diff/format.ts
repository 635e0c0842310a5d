/**
 * Wording of diff entries and change-sheet cells. One place, so the diff detail, the CSV and
 * the CLI name a terminal or a channel the same way.
 */
import type { ChannelRef, Endpoint } from '@/simulator/schema/cell-document';
import type { FieldChange } from './types';

/** `rack 0 / slot 1 / ch 3` (channels count from 0, DESIGN.md). */
export function formatChannel(c: ChannelRef): string {
  return `rack ${c.rack} / slot ${c.slot} / ch ${c.channel}`;
}

/** A wire end: `guard:contact`, `%IX0.4` or `rack 0 / slot 1 / ch 3`. */
export function formatEndpoint(e: Endpoint): string {
  if ('device' in e) return `${e.device}:${e.terminal}`;
  if ('plc' in e) return e.plc;
  return formatChannel(e.controller);
}

/** A value as a person reads it: strings quoted, arrays bracketed, absent as a dash. */
export function formatValue(v: unknown): string {
  if (v === undefined || v === null) return '—';
  if (typeof v === 'string') return JSON.stringify(v);
  if (Array.isArray(v)) return `[${v.map(formatValue).join(', ')}]`;
  if (typeof v === 'object') {
    if ('device' in v || 'plc' in v || 'controller' in v) return formatEndpoint(v as Endpoint);
    return JSON.stringify(v);
  }
  return String(v);
}

// Words for the fields whose names a maintenance lead would not read as English.
const WORDS: Record<string, string> = {
  firstChannel: 'first channel',
  ioRefreshMs: 'I/O refresh (ms)',
  scanPeriodMs: 'scan period (ms)',
  bootMs: 'boot time (ms)',
  cycleDonePulseMs: 'cycle-done pulse (ms)',
  travelMs: 'travel time (ms)',
  buildMs: 'vacuum build time (ms)',
  releaseMs: 'vacuum release time (ms)',
  timeoutMs: 'timeout (ms)',
  speedPercent: 'speed (%)',
  stopCategory: 'stop category',
  homePose: 'home pose',
  positionTolerance: 'position tolerance',
  updatePeriodMs: 'update period (ms)',
  watchdogMs: 'watchdog (ms)',
  inputType: 'input type',
  resolutionBits: 'resolution (bits)',
  schemaVersion: 'schema version',
  controllerPowered: 'controller powered',
};

/** `params.PT` → `PT`, `points.DI4.label` → `DI4 label`, `firstChannel` → `first channel`. */
export function describePath(path: string): string {
  const parts = path.split('.').filter((p, i) => !(i === 0 && (p === 'params' || p === 'points')));
  return parts.map((p) => WORDS[p] ?? p).join(' ') || 'value';
}

/** One change in words: `PT 100 → 150`, `label set to "X"`, `bits removed (was 4)`. */
export function describeChange(c: FieldChange): string {
  const what = describePath(c.path);
  if (c.from === undefined) return `${what} set to ${formatValue(c.to)}`;
  if (c.to === undefined) return `${what} removed (was ${formatValue(c.from)})`;
  return `${what} ${formatValue(c.from)} → ${formatValue(c.to)}`;
}

/** Several changes in words, separated by semicolons. */
export function describeChanges(changes: readonly FieldChange[]): string {
  return changes.map(describeChange).join('; ');
}
