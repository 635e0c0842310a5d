'use client';
import type { ComponentType } from 'react';
import dynamic from 'next/dynamic';
import { PanelArea } from '@/components/panel/panel-area';
import { FieldArea } from '@/components/field/field-area';
import { MonitorArea } from '@/components/monitor/monitor-area';
import { ScopeArea } from '@/components/scope/scope-area';
import type { AreaId } from '../area-tabs';

function Loading({ what }: { what: string }) {
  return <p className="p-6 text-sm text-slate-500">Loading the {what}…</p>;
}

/**
 * The Logic and Controller areas are built by their own components and loaded only when their
 * tab opens, so the canvas library does not weigh on the workspace's first load.
 */
export const LogicSlot = dynamic(() => import('@/components/logic/logic-area'), { ssr: false, loading: () => <Loading what="logic sheet" /> });

export const ControllerSlot = dynamic(() => import('@/components/controller/controller-area'), { ssr: false, loading: () => <Loading what="controller" /> });

const AREA_BODIES: Record<AreaId, ComponentType> = {
  panel: PanelArea,
  field: FieldArea,
  logic: LogicSlot,
  controller: ControllerSlot,
  monitor: MonitorArea,
  scope: ScopeArea,
};

/** The body of one workspace area: the same six areas in the cell workspace and in run workspaces. */
export function AreaBody({ area }: { area: AreaId }) {
  const Body = AREA_BODIES[area];
  return <Body />;
}
