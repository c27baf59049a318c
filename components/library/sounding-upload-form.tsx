'use client';

import { useState } from 'react';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { soundingMetaSchema, type SoundingMeta, type SoundingMetaForm } from '@/lib/validation/library';
import { InputField } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { postUpload } from './upload';
import { CsvFileInput, UploadOutcomeNotice, type LibraryUploadOutcome } from './upload-parts';

const META_FIELDS = [
  { name: 'name', id: 'sounding-name', label: 'Name', hint: 'Such as “Keflavik 12Z, 20 Nov”.', autoComplete: 'off' },
  {
    name: 'station',
    id: 'sounding-station',
    label: 'Station',
    hint: 'Optional: the station or model grid point.',
    autoComplete: 'off',
  },
  {
    name: 'observedAt',
    id: 'sounding-observed',
    label: 'Observation time (UTC)',
    hint: 'Optional.',
    type: 'datetime-local',
  },
] as const;

/**
 * Uploads a sounding CSV with its name, station and observation time; the API finds the WMO
 * tropopause and the page of the new sounding opens. Problems come back by line and column.
 */
export function SoundingUploadForm({ slug, templateHref }: { slug: string; templateHref: string }) {
  const router = useRouter();
  const [chosen, setChosen] = useState<File>();
  const [fileError, setFileError] = useState<string>();
  const [result, setResult] = useState<LibraryUploadOutcome>();
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
    setResult({ ok: false, text: out.message, problems: out.problems, warnings: out.warnings });
  });
  const field = ({ name, ...props }: (typeof META_FIELDS)[number]) => (
    <InputField key={name} {...props} error={errors[name]?.message} {...form.register(name)} />
  );
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {field(META_FIELDS[0])}
      <div className="grid gap-4">{META_FIELDS.slice(1).map(field)}</div>
      <CsvFileInput
        onChange={(e) => setChosen(e.currentTarget.files?.[0])}
        id="sounding-file"
        label="Levels CSV"
        error={fileError}
        hint={
          <>
            One level per line: <code>altitude_m</code> and/or <code>pressure_hpa</code>, and <code>temperature_k</code>{' '}
            or <code>temperature_c</code>; any order, 3 to 500 levels.{' '}
            <a href={templateHref} download="sounding-template.csv" className="text-accent underline">
              Download a template
            </a>
            .
          </>
        }
      />
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? 'Uploading…' : 'Upload sounding'}
      </Button>
      {result ? <UploadOutcomeNotice outcome={result} caption="Problems in the sounding file" /> : null}
    </form>
  );
}
