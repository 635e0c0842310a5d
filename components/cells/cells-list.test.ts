import { describe, expect, it } from 'vitest';
import { createElement, type ReactNode } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { AppRouterContext } from 'next/dist/shared/lib/app-router-context.shared-runtime';
import { MyCells, SharedWithMe } from './cells-list';
import { practiceHref, sharedPracticeTarget } from './practice';
import type { CellSummaryDto, SharedCellDto } from './types';

const OWN = '7b0c5a52-2f4e-4a4f-9d1e-0a6c3f1b2c01';
const COPY = '7b0c5a52-2f4e-4a4f-9d1e-0a6c3f1b2c02';
const SHARED = '7b0c5a52-2f4e-4a4f-9d1e-0a6c3f1b2c03';
const SHARED_NO_COPY = '7b0c5a52-2f4e-4a4f-9d1e-0a6c3f1b2c04';

// Invented demo rows (a fictional school's cells).
const ownCell = (id: string, name: string, origin: CellSummaryDto['origin']): CellSummaryDto => ({
  id,
  name,
  origin,
  ownerId: 'u1',
  ownerName: 'Ada Fenwick',
  sourceCellId: origin === 'shared-copy' ? SHARED : null,
  sourceVersion: origin === 'shared-copy' ? 4 : null,
  latestVersion: 2,
  versionCount: 2,
  createdAt: '2026-03-01T09:00:00.000Z',
  updatedAt: '2026-03-02T09:00:00.000Z',
  sharedWith: [],
});

const sharedCell = (id: string, name: string, myCopyId: string | null): SharedCellDto => ({
  id,
  name,
  ownerName: 'Tomas Reyhill',
  latestVersion: 4,
  updatedAt: '2026-03-01T08:00:00.000Z',
  cohorts: [{ cohortId: 'c0', cohortName: 'Kestrel Vale evening class' }],
  myCopyId,
});

function render(node: ReactNode): string {
  const router = { push: () => undefined, replace: () => undefined, refresh: () => undefined, back: () => undefined, forward: () => undefined, prefetch: () => undefined };
  return renderToStaticMarkup(
    createElement(AppRouterContext.Provider, { value: router as never }, createElement(QueryClientProvider, { client: new QueryClient() }, node)),
  );
}

/** The href of the anchor whose aria-label is `label`, or null when there is none. */
function hrefOf(html: string, label: string): string | null {
  const tag = html.match(new RegExp(`<a[^>]*aria-label="${label}"[^>]*>`))?.[0];
  return tag?.match(/href="([^"]*)"/)?.[1] ?? null;
}

describe('practice targets', () => {
  it('points at the recorded practice run page of the cell', () => {
    // Route app/(signed-in)/runs/practice/[cellId]/page.tsx.
    expect(practiceHref(OWN)).toBe(`/runs/practice/${OWN}`);
    expect(sharedPracticeTarget({ myCopyId: COPY })).toEqual({ kind: 'link', href: `/runs/practice/${COPY}` });
    expect(sharedPracticeTarget({ myCopyId: null })).toEqual({ kind: 'copy-first' });
  });
});

describe('cells list: Practice action', () => {
  it('offers Practice on every own cell, shared copies included', () => {
    const html = render(createElement(MyCells, { cells: [ownCell(OWN, 'Line 3 starter', 'new'), ownCell(COPY, 'Press guard copy', 'shared-copy')], canShare: false, open: () => undefined }));
    expect(hrefOf(html, 'Practice Line 3 starter')).toBe(`/runs/practice/${OWN}`);
    expect(hrefOf(html, 'Practice Press guard copy')).toBe(`/runs/practice/${COPY}`);
  });

  it('offers Practice on shared cells: a link to the copy, or a button that makes the copy first', () => {
    const html = render(createElement(SharedWithMe, { shared: [sharedCell(SHARED, 'Press guard', COPY), sharedCell(SHARED_NO_COPY, 'Sorting conveyor', null)] }));
    // With a copy: the practice page of the student's copy, never of the owner's cell.
    expect(hrefOf(html, 'Practice Press guard')).toBe(`/runs/practice/${COPY}`);
    expect(html).not.toContain(`/runs/practice/${SHARED}`);
    // Without a copy: a button (the copy is made on click), not a link to the owner's cell.
    expect(hrefOf(html, 'Practice Sorting conveyor')).toBeNull();
    expect(html).toMatch(/<button[^>]*aria-label="Practice Sorting conveyor"/);
    expect(html).not.toContain(`/runs/practice/${SHARED_NO_COPY}`);
  });
});
