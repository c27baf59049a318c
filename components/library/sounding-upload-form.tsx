'use client';

import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { soundingMetaSchema, type SoundingMeta, type SoundingMetaForm } from '@/lib/validation/library';
import { Field, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { ProblemsTable } from '@/components/ui/problems-table';
import type { LineProblem } from '@/lib/validation/problems';
import { postUpload } from './upload';

/**
 * Uploads a sounding CSV with its name, station and observation time; the API finds the WMO
 * tropopause and the page of the new sounding opens. Problems come back by line and column.
 */
export function SoundingUploadForm({ slug, templateHref }: { slug: string; templateHref: string }) {
  const router = useRouter();
  const [chosen, setChosen] = useState<File>();
  const [fileError, setFileError] = useState<string>();
  const [result, setResult] = useState<{ text: string; problems: LineProblem[]; warnings: LineProblem[] }>();
  const form = useForm<SoundingMetaForm, unknown, SoundingMeta>({
    resolver: zodResolver(soundingMetaSchema),
    defaultValues: { name: '', station: '', observedAt: '' },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async () => {
    setResult(undefined);
    if (!chosen) {
      setFileError('Choose the CSV file with the levels.');
      return;
    }
    setFileError(undefined);
    const values = form.getValues();
    const body = new FormData();
    body.set('file', chosen);
    body.set('name', values.name);
    body.set('station', values.station ?? '');
    body.set('observedAt', values.observedAt ?? '');
    const out = await postUpload<{ id: number }>(`/api/v1/workspaces/${slug}/soundings/upload`, body);
    if (out.ok && out.body) {
      router.push(`/w/${slug}/soundings/${out.body.id}`);
      return;
    }
    for (const f of out.fields) {
      if (f.path === 'name' || f.path === 'station' || f.path === 'observedAt')
        form.setError(f.path, { type: 'server', message: f.message });
    }
    setResult({ text: out.message, problems: out.problems, warnings: out.warnings });
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <Field id="sounding-name" label="Name" error={errors.name?.message} hint="Such as “Keflavik 12Z, 20 Nov”.">
        <TextInput id="sounding-name" autoComplete="off" invalid={!!errors.name} {...form.register('name')} />
      </Field>
      <div className="grid gap-4">
        <Field
          id="sounding-station"
          label="Station"
          error={errors.station?.message}
          hint="Optional: the station or model grid point."
        >
          <TextInput
            id="sounding-station"
            autoComplete="off"
            invalid={!!errors.station}
            {...form.register('station')}
          />
        </Field>
        <Field
          id="sounding-observed"
          label="Observation time (UTC)"
          error={errors.observedAt?.message}
          hint="Optional."
        >
          <TextInput
            id="sounding-observed"
            type="datetime-local"
            invalid={!!errors.observedAt}
            {...form.register('observedAt')}
          />
        </Field>
      </div>
      <div className="space-y-1">
        <label htmlFor="sounding-file" className="block text-sm font-medium text-ink">
          Levels CSV
        </label>
        <input
          onChange={(e) => setChosen(e.currentTarget.files?.[0])}
          id="sounding-file"
          type="file"
          accept=".csv,text/csv"
          aria-invalid={fileError ? true : undefined}
          aria-describedby={fileError ? 'sounding-file-error' : 'sounding-file-hint'}
          className="block w-full text-sm file:mr-3 file:rounded-md file:border file:border-line-strong file:bg-paper-raised file:px-3 file:py-1.5 file:text-sm"
        />
        {fileError ? (
          <p id="sounding-file-error" role="alert" className="text-xs font-medium text-danger">
            {fileError}
          </p>
        ) : (
          <p id="sounding-file-hint" className="text-xs text-ink-faint">
            One level per line: <code>altitude_m</code> and/or <code>pressure_hpa</code>, and <code>temperature_k</code>{' '}
            or <code>temperature_c</code>; any order, 3 to 500 levels.{' '}
            <a href={templateHref} download="sounding-template.csv" className="text-accent underline">
              Download a template
            </a>
            .
          </p>
        )}
      </div>
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? 'Uploading…' : 'Upload sounding'}
      </Button>
      {result ? (
        <div className="space-y-2">
          <Notice tone="danger" role="alert">
            {result.text}
          </Notice>
          {result.problems.length ? (
            <ProblemsTable problems={result.problems} caption="Problems in the sounding file" />
          ) : null}
          {result.warnings.length ? (
            <ProblemsTable problems={result.warnings} caption="Columns that were ignored" />
          ) : null}
        </div>
      ) : null}
    </form>
  );
}
