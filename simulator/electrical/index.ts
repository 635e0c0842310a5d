/**
 * The electrical layer: how field wiring turns into PLC input values and back.
 * Pure functions; the cell composes them with fault cards.
 */
export type {
  InputType,
  InputReading,
  InputBands,
  ContactKind,
  WireCondition,
  SensorOutput,
  InputModuleKind,
} from './digital';
export {
  IEC_61131_2_BANDS,
  NOMINAL_SUPPLY_V,
  INPUT_OHMS,
  inputReading,
  SUPPLY_MIN_V,
  SUPPLY_MAX_V,
  classifyDigitalInput,
  supplyWithinTolerance,
  contactClosed,
  inputVolts,
  applyInvert,
  sensorDrivesInput,
} from './digital';
export type { SignalRange, AnalogModuleSpec, CountFormat, Ne43Status, WordEncoding } from './analog';
export {
  SIGNAL_SPANS,
  scaleLinear,
  currentToEngineering,
  voltageToEngineering,
  engineeringToSignal,
  countRange,
  signalToCounts,
  countsToSignal,
  ne43Status,
  ne43Valid,
  encodeWord,
  decodeWord,
} from './analog';
