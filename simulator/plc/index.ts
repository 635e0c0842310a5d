/**
 * The PLC layer: logic sheet schema, block catalogue, compiler, reference interpreter.
 * Contract and scan model: ./api.ts.
 */
export type {
  PlcState,
  SerializedPlcState,
  BlockOutputs,
  OutputSlot,
  CompiledSheet,
  InterpretedSheet,
  Problem,
  Result,
  ProcessImage,
  LogicSheet,
  LogicSheetInput,
  SheetBlock,
  SheetConnection,
  BlockType,
  BlockSpec,
  PortSpec,
  PortType,
  BlockGroup,
} from './api';
export {
  BLOCK_TYPES,
  MIN_LOGIC_INPUTS,
  MAX_LOGIC_INPUTS,
  blockCatalogue,
  blockPorts,
  isBlockType,
  portTypesCompatible,
} from './catalogue';
export {
  MAX_BLOCKS,
  MAX_CONNECTIONS,
  MAX_TIME_MS,
  MAX_SCAN_PERIOD_MS,
  INT_MIN,
  INT_MAX,
  logicSheetSchema,
  blockSchema,
  connectionSchema,
  idSchema,
} from './sheet-schema';
export { validateSheet, analyseSheet, zodIssuesToProblems } from './validate';
export type { AnalysedSheet, Driver } from './validate';
export { compileSheet, clonePlcState, serializePlcState, deserializePlcState, BLOCKS_PER_CHUNK } from './compile';
export { interpretSheet } from './interpret';
