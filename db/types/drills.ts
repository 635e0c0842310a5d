import type { FaultCard, Rule } from '@/simulator';

/** Drill shapes as db/drills.ts stores them and lib/schemas/drills.ts checks them. See db/types/users.ts for why here. */

/** Areas of the workspace a drill may open for editing (the panel is always operable). */
export const EDITABLE_AREAS = ['point-map', 'logic', 'wiring', 'routine'] as const;
export type EditableArea = (typeof EDITABLE_AREAS)[number];

/** A rule of the engine with the points it is worth. */
export interface WeightedRule {
  rule: Rule;
  weight: number;
}

/** What a student may do in the drill's workspace. */
export interface DrillPermissions {
  forceAllowed: boolean;
  editable: EditableArea[];
}

/** The cause a student names: a fault kind and where (a device, wiring row, module or point-map row id). */
export interface Diagnosis {
  kind: string;
  location: string;
  note: string;
}

/** A drill as its trainer writes it (after the schema's defaults): what a drill row stores besides its bookkeeping. */
export interface DrillInput {
  title: string;
  cellId: string;
  cellVersion: number;
  brief: string;
  faults: FaultCard[];
  objectives: string[];
  rules: WeightedRule[];
  answer: { kind: string; location: string };
  diagnosisWeight: number;
  timeLimitMs: number;
  permissions: DrillPermissions;
}

/** The image types a brief stores (sniffed from the bytes at upload, lib/drills/sniff.ts). */
export const ASSET_TYPES = ['image/png', 'image/jpeg', 'image/webp', 'image/gif'] as const;
export type AssetType = (typeof ASSET_TYPES)[number];
