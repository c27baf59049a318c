'use client';

import { useEffect, useMemo, useRef, useState } from 'react';
import { get, useForm, type Path, type UseFormRegisterReturn } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import {
  emptyScreenForm,
  formPathFor,
  isFormPath,
  screenFormProblems,
  screenFormSchema,
  type ScreenFormContext,
  type ScreenFormValues,
} from '@/components/screening/screen-form-adapter';
import { Field, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { AssumptionFields } from './assumption-fields';
import { ScreeningPreview, type PreviewResponse } from './screening-preview';
import { useDebouncedValue } from './use-debounced-value';
import { ApiProblem, newIdempotencyKey, readProblem } from './screen-form-api';
import { PreviewSummary, Section } from './screen-form-parts';
import { RouteSection } from './route-section';
import { CruiseSection } from './cruise-section';
import { EmissionSection } from './emission-section';
import { TropopauseSection } from './tropopause-section';
import type { ScreenFlightFormProps } from './screen-form-types';
import type { MinimiseCriterion } from '@/lib/screening';

/** The preview samples like a saved screening's default (400 samples, seed 1) so the two agree. */
const PREVIEW_UNCERTAINTY = { samples: 400, seed: 1 };

export type {
  AircraftChoice,
  EngineChoice,
  RouteChoice,
  ScreenFlightFormProps,
  SoundingChoice,
} from './screen-form-types';

/** The live preview of the settled input: the engine's answer, or the problem it reported. */
function usePreview(slug: string, settled: string | null) {
  return useQuery({
    queryKey: ['screening-preview', slug, settled],
    enabled: settled !== null,
    placeholderData: keepPreviousData,
    retry: false,
    staleTime: 60_000,
    queryFn: async ({ signal }): Promise<PreviewResponse> => {
      const res = await fetch(`/api/v1/workspaces/${slug}/screenings/preview`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', accept: 'application/json' },
        body: settled ?? '{}',
        signal,
      });
      if (!res.ok) throw await readProblem(res);
      return (await res.json()) as PreviewResponse;
    },
  });
}

/** The name and the save button, with what saving counts. */
function SaveSection({
  nameField,
  nameError,
  saveError,
  busy,
}: {
  nameField: UseFormRegisterReturn<'name'>;
  nameError: string | undefined;
  saveError: string | null;
  busy: boolean;
}) {
  return (
    <Section title="Save">
      <Field
        id="name"
        label="Name (optional)"
        hint="Shown in the screenings list; the route is used when blank."
        error={nameError}
      >
        <TextInput id="name" invalid={!!nameError} {...nameField} />
      </Field>
      {saveError ? (
        <Notice tone="danger" role="alert">
          {saveError}
        </Notice>
      ) : null}
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" disabled={busy}>
          {busy ? 'Saving…' : 'Save screening'}
        </Button>
        <p className="text-xs text-ink-soft">Saving counts one screened flight towards this month&apos;s usage.</p>
      </div>
    </Section>
  );
}

/**
 * "Screen a flight": one form for route, cruise, fuel, emission, date and tropopause, with a live
 * preview beside it and a Save that stores the screening once, however often it is clicked.
 */
export function ScreenFlightForm({
  slug,
  units,
  defaults,
  defaultDate,
  aircraft,
  engines,
  routes,
  soundings,
  whatIfDefaults,
  onSaved,
  previewDelayMs = 400,
}: ScreenFlightFormProps) {
  const ctx: ScreenFormContext = useMemo(
    () => ({
      units,
      defaults,
      aircraft: aircraft.map((a) => ({ code: a.code, emission: a.emission, typicalMach: a.typicalMach })),
      engines: engines.map((e) => ({ id: e.id, fuelFlowKgS: e.fuelFlowKgS, eiNoxGPerKg: e.eiNoxGPerKg })),
      soundings: soundings.map((s) => ({ id: s.id, levels: s.levels })),
    }),
    [units, defaults, aircraft, engines, soundings],
  );
  const schema = useMemo(() => screenFormSchema(ctx), [ctx]);
  const initial = useMemo(() => {
    const v = emptyScreenForm(defaultDate);
    if (aircraft.length) {
      v.aircraft = aircraft[0].code;
      v.flightLevel = String(aircraft[0].typicalFlightLevel);
    } else if (engines.length) v.emissionMode = 'engine';
    else v.emissionMode = 'direct';
    if (engines.length) v.engineId = String(engines[0].id);
    return v;
  }, [defaultDate, aircraft, engines]);

  const form = useForm<ScreenFormValues>({
    resolver: zodResolver(schema),
    defaultValues: initial,
    mode: 'onTouched',
    reValidateMode: 'onChange',
  });
  const { register, formState } = form;

  const values = form.watch();
  const errorAt = (path: string): string | undefined => {
    const e = get(formState.errors, path) as { message?: string; root?: { message?: string } } | undefined;
    return e?.message ?? e?.root?.message;
  };

  const { body, problems } = screenFormProblems(values, ctx);
  const { name: _name, ...previewBody } = body;
  const [limit, setLimit] = useState(String(whatIfDefaults.limitPct));
  const limitNumber = Number(limit.replace(',', '.'));
  const limitError =
    limit.trim() === '' || !Number.isFinite(limitNumber) || limitNumber < 0 || limitNumber > 50
      ? 'Give a limit between 0 and 50 %.'
      : null;
  const [minimise, setMinimise] = useState<MinimiseCriterion>('ozone-figure');
  const payload =
    problems.length === 0
      ? JSON.stringify({
          ...previewBody,
          whatIf: limitError ? { minimise } : { maxFuelPenaltyPct: limitNumber, minimise },
          uncertainty: PREVIEW_UNCERTAINTY,
          months: true,
        })
      : null;
  const settled = useDebouncedValue(payload, previewDelayMs);
  const preview = usePreview(slug, settled);

  const modes = {
    routeMode: values.routeMode,
    cruiseMode: values.cruiseMode,
    emissionMode: values.emissionMode,
    tropopauseMode: values.tropopauseMode,
  };
  const modesRef = useRef(modes);
  modesRef.current = modes;
  const previewError = useMemo(
    () =>
      preview.error instanceof ApiProblem
        ? preview.error
        : preview.error
          ? new ApiProblem('The preview could not be worked out. Check your connection and try again.', 0, [])
          : null,
    [preview.error],
  );
  const [previewGeneral, setPreviewGeneral] = useState<string | null>(null);

  // A server error belongs to the input it was computed from: each placed error remembers that
  // input, and goes as soon as the input differs (a new preview places it again if it still holds).
  const saveKey = JSON.stringify(body);
  const placed = useRef<{
    preview: { input: string | null; paths: string[] } | null;
    save: { input: string; paths: string[] } | null;
  }>({ preview: null, save: null });
  const placeServerErrors = (
    fields: { path: string; message: string }[],
    where: Parameters<typeof formPathFor>[1],
  ): { paths: string[]; unplaced: string[] } => {
    const paths: string[] = [];
    const unplaced: string[] = [];
    for (const f of fields) {
      const path = formPathFor(f.path, where);
      if (path && isFormPath(path)) {
        form.setError(path as Path<ScreenFormValues>, { type: 'server', message: f.message });
        paths.push(path);
      } else unplaced.push(f.message);
    }
    return { paths, unplaced };
  };
  const clearServerErrors = (paths: string[]) => {
    for (const path of paths) {
      if (form.getFieldState(path as Path<ScreenFormValues>).error?.type === 'server')
        form.clearErrors(path as Path<ScreenFormValues>);
    }
  };
  // Runs after every render on purpose: it compares the input each placed error came from with the current one.
  // eslint-disable-next-line react-hooks/exhaustive-deps
  useEffect(() => {
    const p = placed.current;
    if (p.preview && p.preview.input !== payload) {
      clearServerErrors(p.preview.paths);
      p.preview = null;
      setPreviewGeneral(null);
    }
    if (p.save && p.save.input !== saveKey) {
      clearServerErrors(p.save.paths);
      p.save = null;
      setSaveError(null);
    }
  });

  useEffect(() => {
    if (!previewError) {
      // No error for the current input (answered, or still being worked out): none from an earlier one stays.
      if (placed.current.preview) clearServerErrors(placed.current.preview.paths);
      placed.current.preview = null;
      setPreviewGeneral(null);
      return;
    }
    const { paths, unplaced } = placeServerErrors(previewError.fields, modesRef.current);
    placed.current.preview = { input: settled, paths };
    setPreviewGeneral(
      previewError.fields.length && !unplaced.length ? null : [previewError.message, ...unplaced].join(' '),
    );
    // Placed once per failed request: previewError is memoised on the request's error, which changes exactly then.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [previewError]);

  const idem = useRef<{ payload: string; key: string } | null>(null);
  const [saveError, setSaveError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const onSubmit = form.handleSubmit(async (v) => {
    setSaveError(null);
    const { body: saveBody } = screenFormProblems(v, ctx);
    const json = JSON.stringify(saveBody);
    if (!idem.current || idem.current.payload !== json) idem.current = { payload: json, key: newIdempotencyKey() };
    let res: Response;
    try {
      res = await fetch(`/api/v1/workspaces/${slug}/screenings`, {
        method: 'POST',
        headers: {
          'content-type': 'application/json',
          accept: 'application/json',
          'idempotency-key': idem.current.key,
        },
        body: json,
      });
    } catch {
      setSaveError('The screening could not be saved: the connection failed. Nothing was saved twice; try again.');
      return;
    }
    if (res.ok) {
      const created = (await res.json()) as { id: number };
      setSaved(true);
      onSaved(created.id);
      return;
    }
    const problem = await readProblem(res);
    const { paths, unplaced } = placeServerErrors(problem.fields, v);
    placed.current.save = { input: json, paths };
    setSaveError(
      problem.fields.length && !unplaced.length
        ? 'Some fields need attention: see the messages beside them.'
        : [problem.message, ...unplaced].join(' '),
    );
  });

  const selectedAircraft = aircraft.find((a) => a.code === values.aircraft);
  const waitingFor = problems.length ? [...new Set(problems.map((p) => p.message))].slice(0, 3) : [];

  return (
    <div className="grid grid-cols-1 gap-6 xl:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
      <form onSubmit={onSubmit} noValidate className="space-y-5" aria-label="Screen a flight">
        <RouteSection
          slug={slug}
          form={form}
          routes={routes}
          errorAt={errorAt}
          understood={preview.data?.result.flightPlan}
        />
        <CruiseSection form={form} units={units} selectedAircraft={selectedAircraft} errorAt={errorAt} />
        <EmissionSection form={form} units={units} aircraft={aircraft} engines={engines} errorAt={errorAt} />
        <TropopauseSection form={form} units={units} soundings={soundings} errorAt={errorAt} />
        <AssumptionFields register={register} defaults={defaults} errorAt={errorAt} />

        <SaveSection
          nameField={register('name')}
          nameError={errorAt('name')}
          saveError={saveError}
          busy={formState.isSubmitting || saved}
        />
        <PreviewSummary
          units={units}
          data={preview.data}
          status={
            waitingFor.length
              ? 'Waiting for complete input'
              : previewGeneral
                ? 'Preview not updated'
                : preview.isFetching || payload !== settled
                  ? 'Updating…'
                  : preview.data
                    ? 'Up to date'
                    : 'Preview'
          }
        />
      </form>
      <div id="preview" className="scroll-mt-4 xl:sticky xl:top-4 xl:self-start">
        <ScreeningPreview
          units={units}
          data={preview.data}
          waitingFor={waitingFor}
          fetching={preview.isFetching}
          stale={payload !== settled || preview.isPlaceholderData}
          error={previewGeneral}
          limit={limit}
          limitError={limitError}
          limitPct={limitError ? whatIfDefaults.limitPct : limitNumber}
          ratePct={whatIfDefaults.ratePct}
          onLimitChange={setLimit}
          minimise={minimise}
          onMinimiseChange={setMinimise}
        />
      </div>
    </div>
  );
}
