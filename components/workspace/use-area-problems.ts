'use client';
import { useMemo } from 'react';
import { shallowEqual, useWorkspace } from './contract';
import { areaProblems, type AreaProblems } from './problems';
import type { AreaId } from './area-tabs';

/** The problems and warnings one area shows (problems.ts), recomputed only when the document or the engine's findings change. */
export function useAreaProblems(area: AreaId): AreaProblems {
  const [document, problems, warnings] = useWorkspace((s) => [s.document, s.engine.problems, s.engine.warnings] as const, shallowEqual);
  return useMemo(() => areaProblems(area, { document, problems, warnings }), [area, document, problems, warnings]);
}
