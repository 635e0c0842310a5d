/**
 * Size limits of a cell document. They keep a hostile or mistaken document from making the
 * engine allocate without bound or spin; every limit is reported as a problem with its path.
 */
export const CELL_LIMITS = {
  /** Longest id (devices, rows, poses, steps ...). */
  idLength: 64,
  /** Longest free-text label or message. */
  textLength: 200,
  panelDevices: 200,
  fieldDevices: 200,
  wiringRows: 2000,
  plcModules: 64,
  controllerModules: 64,
  channelsPerModule: 64,
  pointMapRows: 256,
  pointsPerRow: 64,
  routineSteps: 1000,
  poses: 256,
  axes: 6,
  /** Longest period (scan, refresh, fieldbus update) in ms. */
  periodMs: 10_000,
  /** Longest single duration (travel time, timeout, pause) in ms: one day. */
  durationMs: 86_400_000,
  /** Largest coordinate magnitude (m or rad). */
  coordinate: 1_000,
  /** Largest serialised document in characters, checked by the CLI and the app before parsing. */
  documentChars: 5_000_000,
} as const;

/** Routine steps executed within one controller refresh before the executor yields (guards a jump loop). */
export const MAX_INSTANT_STEPS_PER_REFRESH = 64;
