'use client';
import dynamic from 'next/dynamic';

function Loading({ what }: { what: string }) {
  return <p className="p-6 text-sm text-slate-500">Loading the {what}…</p>;
}

/**
 * The Logic and Controller areas are built by their own components and loaded only when their
 * tab opens, so the canvas library does not weigh on the workspace's first load.
 */
export const LogicSlot = dynamic(() => import('@/components/logic/logic-area'), { ssr: false, loading: () => <Loading what="logic sheet" /> });

export const ControllerSlot = dynamic(() => import('@/components/controller/controller-area'), { ssr: false, loading: () => <Loading what="controller" /> });
