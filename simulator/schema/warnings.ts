/**
 * Warnings about a valid cell document: things a cell may do (it runs anyway) but a
 * technician should look at. Each says what it checks and where the rule comes from.
 */
import { SUPPLY_MAX_V, SUPPLY_MIN_V, NOMINAL_SUPPLY_V } from '@/simulator/electrical';
import type { Problem } from '@/simulator/shared/result';
import type { CellDocument } from './cell-document';

type Colour = CellDocument['panel'][number]['colour'];
type ButtonFunction = NonNullable<Extract<CellDocument['panel'][number], { type: 'push-button' }>['function']>;

/**
 * Colours a button of each function must not have: IEC 60204-1 §10.2.1 (colours of
 * push-button actuators), from memory — START/ON never red; STOP/OFF never green; RESET blue,
 * white, grey or black (so neither red nor green nor yellow); an alternately acting start/stop
 * white, grey or black (never red, yellow or green). `other` has no rule.
 */
const FORBIDDEN: Readonly<Record<ButtonFunction, readonly Colour[]>> = {
  start: ['red'],
  stop: ['green'],
  reset: ['red', 'yellow', 'green'],
  'start-stop': ['red', 'yellow', 'green'],
  other: [],
};

/** Colour warnings of the panel: buttons against their function, e-stops red on yellow (IEC 60204-1 §10.7.3, ISO 13850 §4.3.6; from memory). */
export function panelColourWarnings(panel: CellDocument['panel']): Problem[] {
  const out: Problem[] = [];
  panel.forEach((d, i) => {
    if (d.type === 'e-stop') {
      if (d.colour !== 'red') out.push({ path: ['panel', i, 'colour'], code: 'colour_for_function', message: `e-stop "${d.id}" is ${d.colour}: an emergency stop actuator is red (IEC 60204-1 §10.7.3)` });
      const bg = d.background ?? 'yellow';
      if (bg !== 'yellow') out.push({ path: ['panel', i, 'background'], code: 'colour_for_function', message: `e-stop "${d.id}" sits on ${bg}: an emergency stop's background is yellow (IEC 60204-1 §10.7.3)` });
      return;
    }
    if ((d.type === 'push-button' || d.type === 'illuminated-button') && d.function && FORBIDDEN[d.function].includes(d.colour)) {
      out.push({ path: ['panel', i, 'colour'], code: 'colour_for_function', message: `${d.function} button "${d.id}" must not be ${d.colour} (IEC 60204-1 §10.2.1)` });
    }
  });
  return out;
}

/**
 * Every warning about a valid document: the panel's colours, and a 24 V supply outside the
 * IEC 61131-2 tolerance of 20.4–28.8 V (the cell runs it, and its inputs read it through
 * their type's bands).
 */
export function documentWarnings(doc: CellDocument): Problem[] {
  const out = panelColourWarnings(doc.panel);
  const v = doc.supply?.volts ?? NOMINAL_SUPPLY_V;
  if (v < SUPPLY_MIN_V || v > SUPPLY_MAX_V) {
    out.push({ path: ['supply', 'volts'], code: 'supply_out_of_tolerance', message: `the 24 V supply is set to ${v} V, outside ${SUPPLY_MIN_V}–${SUPPLY_MAX_V} V (IEC 61131-2)` });
  }
  return out;
}
