/**
 * 24 V DC discrete signals: IEC 61131-2 input types, supply tolerance, NO/NC contacts,
 * wiring conditions, the per-point invert, and PNP/NPN sensors on sinking/sourcing inputs.
 */

/** IEC 61131-2 digital input type for 24 V DC. */
export type InputType = 1 | 2 | 3;
/** How an input reads a voltage: ON band, OFF band, or neither (transition or out of rating). */
export type InputReading = 'on' | 'off' | 'undefined';

/** Voltage and current limits of one input type. */
export type InputBands = {
  /** ON band: onMinV ≤ U ≤ maxV and, when current is known, I ≥ onMinMa. */
  onMinV: number;
  maxV: number;
  onMinMa: number;
  /** OFF band: minV ≤ U ≤ offMaxV, or (current known) I ≤ offMaxMa. */
  minV: number;
  offMaxV: number;
  offMaxMa: number;
};

/**
 * IEC 61131-2 (Ed. 3, 2007), limits for current-sinking 24 V DC digital inputs, types 1–3
 * (from memory: U_H min 15/11/11 V, U_H max 30 V, I_H min 2/6/2 mA; U_L max 5 V,
 * U_L min −3 V; transition current I_T min 0.5/2/1.5 mA).
 */
export const IEC_61131_2_BANDS: Readonly<Record<InputType, InputBands>> = Object.freeze({
  1: { onMinV: 15, maxV: 30, onMinMa: 2, minV: -3, offMaxV: 5, offMaxMa: 0.5 },
  2: { onMinV: 11, maxV: 30, onMinMa: 6, minV: -3, offMaxV: 5, offMaxMa: 2 },
  3: { onMinV: 11, maxV: 30, onMinMa: 2, minV: -3, offMaxV: 5, offMaxMa: 1.5 },
});

/**
 * Classifies a measured input voltage (and optionally the input current) per IEC 61131-2.
 * Between the OFF and ON bands the reading is `undefined` (the transition region, where a
 * real input may read either way); outside −3..30 V it is `undefined` too, being beyond
 * the input's rating. With current known, a current at or below the type's transition
 * minimum reads OFF, and an ON voltage with too little current is `undefined`.
 */
export function classifyDigitalInput(volts: number, type: InputType, currentMa?: number): InputReading {
  const b = IEC_61131_2_BANDS[type];
  if (!Number.isFinite(volts) || volts < b.minV || volts > b.maxV) return 'undefined';
  if (volts <= b.offMaxV) return 'off';
  if (currentMa !== undefined && Number.isFinite(currentMa) && currentMa <= b.offMaxMa) return 'off';
  if (volts >= b.onMinV) {
    if (currentMa !== undefined && !(currentMa >= b.onMinMa)) return 'undefined';
    return 'on';
  }
  return 'undefined';
}

/**
 * The input as a resistor (our model, not the standard's): sized so that at the type's
 * lowest ON voltage it draws its lowest ON current with a 25 % margin, R = 0.8 · U_H min /
 * I_H min — 6 kΩ (type 1), ≈1.47 kΩ (type 2), 4.4 kΩ (type 3). Type 2's low resistance is
 * why it tolerates a two-wire sensor's leakage: the same current makes a smaller voltage.
 */
export const INPUT_OHMS: Readonly<Record<InputType, number>> = Object.freeze({
  1: (0.8 * IEC_61131_2_BANDS[1].onMinV) / (IEC_61131_2_BANDS[1].onMinMa / 1000),
  2: (0.8 * IEC_61131_2_BANDS[2].onMinV) / (IEC_61131_2_BANDS[2].onMinMa / 1000),
  3: (0.8 * IEC_61131_2_BANDS[3].onMinV) / (IEC_61131_2_BANDS[3].onMinMa / 1000),
});

/**
 * What a 24 V DC input of a given type reads when `volts` stand across it, its current
 * following from its resistance ({@link INPUT_OHMS}) — or, for a source that pushes a fixed
 * current through it (a sensor's off-state leakage), from that current: the voltage is then
 * I × R. The reading classifies both per IEC 61131-2 ({@link classifyDigitalInput}).
 */
export function inputReading(type: InputType, drive: { volts: number } | { leakMa: number }): { volts: number; currentMa: number; reading: InputReading } {
  const R = INPUT_OHMS[type];
  const volts = 'volts' in drive ? drive.volts : (drive.leakMa / 1000) * R;
  const currentMa = 'volts' in drive ? (drive.volts / R) * 1000 : drive.leakMa;
  return { volts, currentMa, reading: classifyDigitalInput(volts, type, currentMa) };
}

/** Nominal control voltage. */
export const NOMINAL_SUPPLY_V = 24;
/**
 * 24 V DC supply tolerance −15 % / +20 %: 20.4 V to 28.8 V (IEC 61131-2 rated DC range,
 * from memory; common practice for 24 V DC control supplies).
 */
export const SUPPLY_MIN_V = 20.4;
export const SUPPLY_MAX_V = 28.8;

/** True when a 24 V DC supply voltage lies within the tolerance band (inclusive). */
export function supplyWithinTolerance(volts: number): boolean {
  return volts >= SUPPLY_MIN_V && volts <= SUPPLY_MAX_V;
}

/** Contact form: normally open (closes when actuated) or normally closed (opens when actuated). */
export type ContactKind = 'NO' | 'NC';

/** Whether a contact conducts: NO closes when actuated, NC opens when actuated. */
export function contactClosed(kind: ContactKind, actuated: boolean): boolean {
  return kind === 'NO' ? actuated : !actuated;
}

/** The state of the wire between a source and its input terminal. */
export type WireCondition = 'ok' | 'open' | 'short_to_24v' | 'short_to_0v';

/**
 * Voltage across a digital input: the supply while its source drives it and the wire is
 * sound, 0 V through an open wire whatever the source does, and a short to a supply rail
 * puts that rail on the input — across a sinking input only +24 V drives current, across a
 * sourcing one only 0 V. So an open wire makes an NO circuit look "not actuated" (a start
 * button that cannot start) and an NC circuit look "actuated" (a stop or e-stop that reads
 * as pressed) — why stop circuits are wired NC (common practice; IEC 60204-1 relies on the
 * same fail-to-stop behaviour).
 */
export function inputVolts(driven: boolean, wire: WireCondition, module: InputModuleKind, supplyV: number = NOMINAL_SUPPLY_V): number {
  switch (wire) {
    case 'short_to_24v':
      return module === 'sinking' ? supplyV : 0;
    case 'short_to_0v':
      return module === 'sinking' ? 0 : supplyV;
    case 'open':
      return 0;
    case 'ok':
      return driven ? supplyV : 0;
  }
}

/** Applies a point's invert flag: an inverted point reads the opposite logical state. */
export function applyInvert(on: boolean, invert: boolean): boolean {
  return invert ? !on : on;
}

/** Sensor output stage: PNP switches +24 V to the load (sourcing), NPN switches the load to 0 V (sinking). */
export type SensorOutput = 'PNP' | 'NPN';
/**
 * Input module kind: a sinking input takes current in and returns it to 0 V (wants a PNP
 * sensor); a sourcing input supplies current out to a switch that returns it to 0 V
 * (wants an NPN sensor). Common practice, any PLC textbook.
 */
export type InputModuleKind = 'sinking' | 'sourcing';

/**
 * Whether a three-wire sensor's output stage can drive an input: PNP (sourcing) into a
 * sinking input, NPN (sinking) into a sourcing one. A mismatch never drives current through
 * the input: the sensor's own indicator lights on detection but the input stays off
 * (common practice, any PLC textbook).
 */
export function sensorDrivesInput(sensor: SensorOutput, module: InputModuleKind): boolean {
  return (sensor === 'PNP') === (module === 'sinking');
}
