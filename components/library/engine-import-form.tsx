'use client';

import { useRef, useState } from 'react';
import { useRouter } from 'next/navigation';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { ProblemsTable } from '@/components/ui/problems-table';
import type { LineProblem } from '@/lib/validation/problems';
import { postUpload } from './upload';
import { CsvFileInput } from './upload-parts';

/** Imports engines from a CSV through the API: all rows or none, with every problem by line and column. */
export function EngineImportForm({ slug }: { slug: string }) {
  const router = useRouter();
  const input = useRef<HTMLInputElement>(null);
  const [busy, setBusy] = useState(false);
  const [fileError, setFileError] = useState<string>();
  const [result, setResult] = useState<{
    tone: 'success' | 'danger';
    text: string;
    problems: LineProblem[];
    warnings: LineProblem[];
  }>();
  const endpoint = `/api/v1/workspaces/${slug}/engines/import`;
  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    setResult(undefined);
    const file = input.current?.files?.[0];
    if (!file) {
      setFileError('Choose the CSV file to import.');
      return;
    }
    setFileError(undefined);
    setBusy(true);
    const form = new FormData();
    form.set('file', file);
    const out = await postUpload<{ items: { name: string }[] }>(endpoint, form);
    setBusy(false);
    if (out.ok && out.body) {
      const n = out.body.items.length;
      setResult({
        tone: 'success',
        text: `Imported ${n} engine${n === 1 ? '' : 's'}.`,
        problems: [],
        warnings: out.warnings,
      });
      if (input.current) input.current.value = '';
      router.refresh();
    } else setResult({ tone: 'danger', text: out.message, problems: out.problems, warnings: out.warnings });
  };
  return (
    <form onSubmit={submit} noValidate className="space-y-3">
      <p className="text-sm text-ink-soft">
        One engine per line with the columns{' '}
        <code className="text-xs">
          name, idle_ff_kg_s, approach_ff_kg_s, climb_out_ff_kg_s, take_off_ff_kg_s, idle_ei, approach_ei, climb_out_ei,
          take_off_ei, source
        </code>
        . If any line has a problem, nothing is imported.{' '}
        <a href={endpoint} download="engines-template.csv" className="text-accent underline">
          Download the template
        </a>
        .
      </p>
      <CsvFileInput ref={input} id="engines-csv" label="Engines CSV" error={fileError} />
      <Button type="submit" variant="secondary" disabled={busy}>
        {busy ? 'Importing…' : 'Import engines'}
      </Button>
      {result ? (
        <div className="space-y-2">
          <Notice tone={result.tone} role={result.tone === 'danger' ? 'alert' : 'status'}>
            {result.text}
          </Notice>
          {result.problems.length ? (
            <ProblemsTable problems={result.problems} caption="Problems in the engines file" />
          ) : null}
          {result.warnings.length ? (
            <div>
              <p className="mb-1 text-xs font-medium text-ink-soft">Ignored</p>
              <ProblemsTable problems={result.warnings} caption="Columns that were ignored" />
            </div>
          ) : null}
        </div>
      ) : null}
    </form>
  );
}
