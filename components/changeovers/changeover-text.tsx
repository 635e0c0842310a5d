'use client';
/** What changes and why: shown to everyone, edited by the opener until sign-off. */
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { Pencil } from 'lucide-react';
import { fetchJson } from '@/lib/api/client';
import { changeoverDescriptionSchema, changeoverTitleSchema } from '@/lib/schemas/changeovers';
import { Button } from '@/components/ui/button';
import { TextAreaField, TextField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { applyServerErrors } from '@/components/ui/use-server-field-errors';

const textSchema = z.object({ title: changeoverTitleSchema, description: changeoverDescriptionSchema });
type TextValues = z.input<typeof textSchema>;

export function ChangeoverText({ id, title, description, canEdit }: { id: string; title: string; description: string; canEdit: boolean }) {
  const router = useRouter();
  const [editing, setEditing] = useState(false);
  const [failure, setFailure] = useState<string | null>(null);
  const form = useForm<TextValues>({ resolver: zodResolver(textSchema), defaultValues: { title, description } });
  const save = useMutation({
    mutationFn: (body: TextValues) => fetchJson(`/api/changeovers/${id}`, { method: 'PATCH', body }),
    onSuccess: () => {
      setEditing(false);
      router.refresh();
    },
    onError: (err) => setFailure(applyServerErrors(err, form.setError, ['title', 'description'])),
  });
  if (!editing) {
    return (
      <div className="space-y-2">
        {description ? (
          <p className="whitespace-pre-line text-sm text-slate-800" data-testid="changeover-description">
            {description}
          </p>
        ) : (
          <p className="text-sm italic text-slate-500">No description yet: say what changes and why, for the shift that reads the record.</p>
        )}
        {canEdit ? (
          <Button variant="ghost" className="px-2 py-1 text-xs" onClick={() => setEditing(true)}>
            <Pencil aria-hidden className="h-3.5 w-3.5" /> Edit title and description
          </Button>
        ) : null}
      </div>
    );
  }
  const { errors } = form.formState;
  return (
    <form
      noValidate
      className="space-y-3"
      onSubmit={form.handleSubmit((v) => {
        setFailure(null);
        save.mutate(v);
      })}
    >
      {failure ? <Notice tone="error">{failure}</Notice> : null}
      <TextField id="co-edit-title" label="Title" error={errors.title?.message} {...form.register('title')} />
      <TextAreaField id="co-edit-description" label="What changes and why" rows={5} error={errors.description?.message} {...form.register('description')} />
      <div className="flex gap-2">
        <Button type="submit" disabled={save.isPending}>
          Save
        </Button>
        <Button variant="secondary" onClick={() => setEditing(false)}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
