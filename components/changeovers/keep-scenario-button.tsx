'use client';
/**
 * "Keep as scenario" on a finished run's page: one step from a run to a named scenario of the
 * run's cell, which every changeover of that cell then re-runs on base and proposal.
 */
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { BookmarkPlus } from 'lucide-react';
import { Button } from '@/components/ui/button';
import { ApiClientError, fetchJson } from '@/lib/api/client';
import { keepScenarioSchema } from '@/lib/schemas/evidence';

type Kept = { scenario: { id: string; name: string; eventCount: number }; leftOut: number };

export function KeepScenarioButton({ runId, cellName, suggestedName }: { runId: string; cellName: string; suggestedName: string }) {
  const [open, setOpen] = useState(false);
  const [kept, setKept] = useState<Kept | null>(null);
  const form = useForm<z.input<typeof keepScenarioSchema>, unknown, z.output<typeof keepScenarioSchema>>({ resolver: zodResolver(keepScenarioSchema), defaultValues: { name: suggestedName, description: '' } });
  const { errors, isSubmitting } = form.formState;

  if (kept) {
    return (
      <p role="status" className="text-sm text-accent-900" data-testid="scenario-kept">
        Kept as scenario “{kept.scenario.name}” of {cellName} ({kept.scenario.eventCount} events
        {kept.leftOut > 0 ? `; ${kept.leftOut} editing event${kept.leftOut === 1 ? '' : 's'} left out — a scenario replays operator actions on each version’s own logic` : ''}).
      </p>
    );
  }
  if (!open) {
    return (
      <Button variant="secondary" onClick={() => setOpen(true)} data-testid="keep-scenario">
        <BookmarkPlus aria-hidden className="h-4 w-4" /> Keep as scenario
      </Button>
    );
  }
  return (
    <form
      aria-label="Keep as scenario"
      className="flex flex-wrap items-start gap-2"
      noValidate
      onSubmit={form.handleSubmit(async (values) => {
        try {
          setKept(await fetchJson<Kept>(`/api/runs/${runId}/scenario`, { method: 'POST', body: values }));
        } catch (e) {
          const message = e instanceof ApiClientError ? (e.fields?.name?.join(' ') ?? e.message) : 'The scenario could not be kept.';
          form.setError('name', { message });
        }
      })}
    >
      <label className="text-sm">
        <span className="sr-only">Scenario name</span>
        <input aria-label="Scenario name" className="w-72 rounded-md border border-slate-300 px-2 py-1.5 text-sm" aria-invalid={Boolean(errors.name)} {...form.register('name')} />
        {errors.name ? (
          <span role="alert" className="mt-1 block max-w-xs text-xs text-red-700">
            {errors.name.message}
          </span>
        ) : null}
      </label>
      <Button type="submit" disabled={isSubmitting}>
        Keep
      </Button>
      <Button variant="ghost" onClick={() => setOpen(false)}>
        Cancel
      </Button>
    </form>
  );
}
