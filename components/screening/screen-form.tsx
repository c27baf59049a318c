'use client';

import { useEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import { Controller, get, useFieldArray, useForm, type Path } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import {
  emptyScreenForm,
  formPathFor,
  isFormPath,
  parseWaypointList,
  screenFormProblems,
  screenFormSchema,
  unitLabels,
  type AssumptionDefaults,
  type ScreenFormContext,
  type ScreenFormValues,
  type UnitSystem,
} from '@/lib/validation/screen-form';
import type { ScreeningInputRaw, SoundingLevelInput } from '@/lib/validation/screening';
import { Field, SelectInput, TextArea, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { formatAltitude, formatMass, formatNumber, formatPercent } from '@/lib/format';
import { AirportCombobox } from './airport-combobox';
import { AssumptionFields } from './assumption-fields';
import { ScreeningPreview, type PreviewResponse } from './screening-preview';
import { useDebouncedValue } from './use-debounced-value';

export interface AircraftChoice {
  code: string;
  name: string;
  engineName: string | null;
  engineCount: number;
  typicalMach: number;
  typicalFlightLevel: number;
  directEiGPerKg: number | null;
  emission: ScreeningInputRaw['emission'] | null;
}

export interface EngineChoice {
  id: number;
  name: string;
  fuelFlowKgS: [number, number, number, number];
  eiNoxGPerKg: [number, number, number, number];
}

export interface RouteChoice {
  id: number;
  name: string;
  notes: string;
  waypoints: ({ lat: number; lon: number } | { airport: string })[];
  /** Each waypoint's coordinates (airports resolved on the server), null when unknown. */
  coordinates: ({ lat: number; lon: number } | null)[];
}

export interface SoundingChoice {
  id: number;
  name: string;
  station: string;
  observedAt: string | null;
  levels: SoundingLevelInput[];
  tropopause: { altitudeM: number; pressureHpa: number; temperatureK: number } | null;
}

export interface ScreenFlightFormProps {
  slug: string;
  units: UnitSystem;
  defaults: AssumptionDefaults;
  defaultDate: string;
  aircraft: AircraftChoice[];
  engines: EngineChoice[];
  routes: RouteChoice[];
  soundings: SoundingChoice[];
  /** Defaults of the what-if comparison, from the engine: fuel-penalty limit and penalty per 1000 ft, %. */
  whatIfDefaults: { limitPct: number; ratePct: number };
  onSaved: (id: number) => void;
  previewDelayMs?: number;
}

class ApiProblem extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly fields: { path: string; message: string }[],
  ) {
    super(message);
  }
}

async function readProblem(res: Response): Promise<ApiProblem> {
  const body = (await res.json().catch(() => null)) as { error?: { message?: string; fields?: { path: string; message: string }[] } } | null;
  const fields = body?.error?.fields ?? [];
  let message = body?.error?.message ?? 'The screening service did not answer. Try again in a moment.';
  if (res.status === 429) message = 'Too many previews in a short time; the preview resumes in a moment.';
  if (res.status === 401) message = 'Your session has ended. Sign in again to continue.';
  return new ApiProblem(message, res.status, fields);
}

function newIdempotencyKey(): string {
  if (typeof crypto !== 'undefined' && typeof crypto.randomUUID === 'function') return crypto.randomUUID();
  return `save-${Date.now().toString(36)}-${Math.random().toString(36).slice(2)}`;
}

const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];

function ModeSwitch<T extends string>({ legend, name, value, options, onChange }: { legend: string; name: string; value: T; options: [T, string][]; onChange: (v: T) => void }) {
  return (
    <fieldset>
      <legend className="mb-1.5 text-sm font-medium text-ink">{legend}</legend>
      <div className="inline-flex flex-wrap gap-1 rounded-md border border-line-strong bg-paper-sunk p-1">
        {options.map(([v, label]) => (
          <label
            key={v}
            className={`cursor-pointer rounded px-3 py-1.5 text-sm has-[:focus-visible]:outline has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-accent ${
              value === v ? 'bg-paper-raised font-medium text-ink shadow-sm' : 'text-ink-soft hover:text-ink'
            }`}
          >
            <input type="radio" className="sr-only" name={name} value={v} checked={value === v} onChange={() => onChange(v)} />
            {label}
          </label>
        ))}
      </div>
    </fieldset>
  );
}

function Section({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="rounded-card border border-line bg-paper-raised p-5 shadow-sm">
      <h2 className="mb-4 text-base font-semibold text-ink">{title}</h2>
      <div className="space-y-4">{children}</div>
    </section>
  );
}

function FieldProblem({ message }: { message?: string }) {
  if (!message) return null;
  return (
    <p role="alert" className="text-xs font-medium text-danger">
      {message}
    </p>
  );
}

/**
 * Below the two-column width the preview sits under the form: this bar keeps its headline figures in
 * view at the bottom of the screen while the form is edited, with a link down to the whole preview.
 */
function PreviewSummary({ units, data, status }: { units: UnitSystem; data: PreviewResponse | undefined; status: string }) {
  const r = data?.result;
  return (
    <div role="region" aria-label="Preview summary" className="sticky bottom-0 z-20 -mx-1 rounded-t-md border border-line bg-paper-raised/95 px-3 py-2 shadow-lg backdrop-blur xl:hidden" data-testid="preview-summary">
      <div className="flex flex-wrap items-center gap-x-4 gap-y-1 text-sm">
        <span className="text-xs font-medium text-ink-soft">{status}</span>
        {r ? (
          <dl className="figure flex flex-wrap gap-x-4 gap-y-0.5">
            <div className="flex gap-1">
              <dt className="text-ink-soft">NOx above tropopause</dt>
              <dd className="font-semibold text-strato-strong">{formatMass(r.noxAboveTropopauseKg, units)}</dd>
            </div>
            <div className="flex gap-1">
              <dt className="text-ink-soft">Share above</dt>
              <dd className="font-semibold">{formatPercent(r.fractionAboveTropopause, 1)}</dd>
            </div>
            <div className="flex gap-1">
              <dt className="text-ink-soft">Ozone figure</dt>
              <dd className="font-semibold">{formatMass(r.ozoneLoss.centralKg, units)}</dd>
            </div>
          </dl>
        ) : null}
        <a href="#preview" className="ml-auto text-sm font-medium text-accent-strong underline">
          Whole preview
        </a>
      </div>
    </div>
  );
}

/**
 * "Screen a flight": one form for route, cruise, fuel, emission, date and tropopause, with a live
 * preview beside it and a Save that stores the screening once, however often it is clicked.
 */
export function ScreenFlightForm({ slug, units, defaults, defaultDate, aircraft, engines, routes, soundings, whatIfDefaults, onSaved, previewDelayMs = 400 }: ScreenFlightFormProps) {
  const u = unitLabels(units);
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

  const form = useForm<ScreenFormValues>({ resolver: zodResolver(schema), defaultValues: initial, mode: 'onTouched', reValidateMode: 'onChange' });
  const { control, register, setValue, formState } = form;
  const airports = useFieldArray({ control, name: 'airports' });
  const points = useFieldArray({ control, name: 'points' });
  const steps = useFieldArray({ control, name: 'steps' });

  const values = form.watch();
  const errorAt = (path: string): string | undefined => {
    const e = get(formState.errors, path) as { message?: string; root?: { message?: string } } | undefined;
    return e?.message ?? e?.root?.message;
  };

  const { body, problems } = screenFormProblems(values, ctx);
  const { name: _name, ...previewBody } = body;
  const [limit, setLimit] = useState(String(whatIfDefaults.limitPct));
  const limitNumber = Number(limit.replace(',', '.'));
  const limitError = limit.trim() === '' || !Number.isFinite(limitNumber) || limitNumber < 0 || limitNumber > 50 ? 'Give a limit between 0 and 50 %.' : null;
  const payload = problems.length === 0 ? JSON.stringify({ ...previewBody, whatIf: limitError ? {} : { maxFuelPenaltyPct: limitNumber } }) : null;
  const settled = useDebouncedValue(payload, previewDelayMs);
  const preview = useQuery({
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

  const modes = { routeMode: values.routeMode, cruiseMode: values.cruiseMode, emissionMode: values.emissionMode, tropopauseMode: values.tropopauseMode };
  const modesRef = useRef(modes);
  modesRef.current = modes;
  const previewError = preview.error instanceof ApiProblem ? preview.error : preview.error ? new ApiProblem('The preview could not be worked out. Check your connection and try again.', 0, []) : null;
  const [previewGeneral, setPreviewGeneral] = useState<string | null>(null);

  // A server error belongs to the input it was computed from: each placed error remembers that
  // input, and goes as soon as the input differs (a new preview places it again if it still holds).
  const saveKey = JSON.stringify(body);
  const placed = useRef<{ preview: { input: string | null; paths: string[] } | null; save: { input: string; paths: string[] } | null }>({ preview: null, save: null });
  const placeServerErrors = (fields: { path: string; message: string }[], where: Parameters<typeof formPathFor>[1]): { paths: string[]; unplaced: string[] } => {
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
      if (form.getFieldState(path as Path<ScreenFormValues>).error?.type === 'server') form.clearErrors(path as Path<ScreenFormValues>);
    }
  };
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
    setPreviewGeneral(previewError.fields.length && !unplaced.length ? null : [previewError.message, ...unplaced].join(' '));
    // Placed once per failed request: the error object changes exactly then.
  }, [preview.error]);

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
        headers: { 'content-type': 'application/json', accept: 'application/json', 'idempotency-key': idem.current.key },
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
    setSaveError(problem.fields.length && !unplaced.length ? 'Some fields need attention: see the messages beside them.' : [problem.message, ...unplaced].join(' '));
  });

  const [pasteText, setPasteText] = useState('');
  const [pasteProblems, setPasteProblems] = useState<string[]>([]);
  const applyPasted = () => {
    const parsed = parseWaypointList(pasteText);
    if (parsed.problems.length) {
      setPasteProblems(parsed.problems.map((p) => p.message));
      return;
    }
    if (parsed.points.length < 2) {
      setPasteProblems(['Paste at least two points, one per line.']);
      return;
    }
    setPasteProblems([]);
    points.replace(parsed.points.map((p) => ({ lat: String(p.lat), lon: String(p.lon) })));
  };

  const [routeNote, setRouteNote] = useState<string | null>(null);
  const applySavedRoute = (id: string) => {
    const route = routes.find((r) => String(r.id) === id);
    if (!route) return;
    if (route.waypoints.every((w) => 'airport' in w)) {
      setValue('routeMode', 'airports');
      airports.replace(route.waypoints.map((w) => ({ code: 'airport' in w ? w.airport.toUpperCase() : '' })));
    } else {
      setValue('routeMode', 'points');
      points.replace(route.coordinates.map((c) => (c ? { lat: String(c.lat), lon: String(c.lon) } : { lat: '', lon: '' })));
    }
    setRouteNote(`${route.name}: ${route.waypoints.length} points${route.notes ? `. ${route.notes}` : ''}`);
  };

  // Waypoints a step climb may start at: the route's intermediate points (index in the route).
  const stepWaypoints =
    values.routeMode === 'airports'
      ? values.airports.slice(1, -1).map((a, k) => ({ index: k + 1, label: `${a.code.trim().toUpperCase() || `Stop ${k + 1}`} (stop ${k + 1})` }))
      : values.points.slice(1, -1).map((p, k) => ({ index: k + 1, label: `Point ${k + 2}${p.lat && p.lon ? ` (${p.lat}, ${p.lon})` : ''}` }));
  const selectedAircraft = aircraft.find((a) => a.code === values.aircraft);
  const showMethod = values.emissionMode === 'engine' || (values.emissionMode === 'aircraft' && !!selectedAircraft?.emission && 'engine' in selectedAircraft.emission);
  const selectedSounding = soundings.find((s) => String(s.id) === values.soundingId);
  const waitingFor = problems.length ? [...new Set(problems.map((p) => p.message))].slice(0, 3) : [];

  return (
    <div className="grid gap-6 xl:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
      <form onSubmit={onSubmit} noValidate className="space-y-5" aria-label="Screen a flight">
        <Section title="Route">
          {routes.length ? (
            <Field id="saved-route" label="Start from a saved route" hint={routeNote ?? 'Fills the route below; you can still change it.'}>
              <SelectInput id="saved-route" defaultValue="" onChange={(e) => applySavedRoute(e.target.value)}>
                <option value="">Choose a saved route…</option>
                {routes.map((r) => (
                  <option key={r.id} value={r.id}>
                    {r.name}
                  </option>
                ))}
              </SelectInput>
            </Field>
          ) : null}
          <ModeSwitch
            legend="Give the route as"
            name="routeMode"
            value={values.routeMode}
            options={[
              ['airports', 'Airports'],
              ['points', 'Coordinates'],
            ]}
            onChange={(v) => setValue('routeMode', v, { shouldValidate: formState.isSubmitted })}
          />
          {values.routeMode === 'airports' ? (
            <div className="space-y-3">
              {airports.fields.map((f, i) => (
                <div key={f.id} className="flex items-start gap-2">
                  <div className="min-w-0 flex-1">
                    <Controller
                      control={control}
                      name={`airports.${i}.code`}
                      render={({ field }) => (
                        <AirportCombobox
                          id={`airports-${i}`}
                          label={i === 0 ? 'From' : i === airports.fields.length - 1 ? 'To' : `Stop ${i}`}
                          value={field.value}
                          onChange={field.onChange}
                          onBlur={field.onBlur}
                          name={field.name}
                          placeholder={i === 0 ? 'EGLL' : i === airports.fields.length - 1 ? 'RJAA' : 'BIKF'}
                          error={errorAt(`airports.${i}.code`)}
                        />
                      )}
                    />
                  </div>
                  {airports.fields.length > 2 ? (
                    <Button variant="ghost" className="mt-6" onClick={() => airports.remove(i)} aria-label={`Remove ${i === 0 ? 'the departure' : i === airports.fields.length - 1 ? 'the destination' : `stop ${i}`}`}>
                      Remove
                    </Button>
                  ) : null}
                </div>
              ))}
              <Button variant="secondary" onClick={() => airports.insert(airports.fields.length - 1, { code: '' })} disabled={airports.fields.length >= 20}>
                Add a stop
              </Button>
            </div>
          ) : (
            <div className="space-y-3">
              {points.fields.map((f, i) => (
                <div key={f.id} className="flex items-start gap-2" data-testid="point-row">
                  <Field id={`points-${i}-lat`} label={`Point ${i + 1} latitude`} error={errorAt(`points.${i}.lat`)} className="min-w-0 flex-1">
                    <TextInput id={`points-${i}-lat`} inputMode="decimal" placeholder="51.47" invalid={!!errorAt(`points.${i}.lat`)} {...register(`points.${i}.lat`)} />
                  </Field>
                  <Field id={`points-${i}-lon`} label="longitude" error={errorAt(`points.${i}.lon`)} className="min-w-0 flex-1">
                    <TextInput id={`points-${i}-lon`} inputMode="decimal" placeholder="-0.45" invalid={!!errorAt(`points.${i}.lon`)} {...register(`points.${i}.lon`)} />
                  </Field>
                  {points.fields.length > 2 ? (
                    <Button variant="ghost" className="mt-6" onClick={() => points.remove(i)} aria-label={`Remove point ${i + 1}`}>
                      Remove
                    </Button>
                  ) : null}
                </div>
              ))}
              <p className="text-xs text-ink-faint">Degrees, north and east positive. The route follows great circles between the points.</p>
              <Button variant="secondary" onClick={() => points.append({ lat: '', lon: '' })} disabled={points.fields.length >= 500}>
                Add a point
              </Button>
              <div className="space-y-2 rounded-md border border-dashed border-line-strong p-3">
                <Field id="points-paste" label="Or paste a list of points" hint={'One point per line, latitude first: "51.47 -0.45", "51.47N 0.45W", "6012N01105E", "60 12.5N 011 05.3E" or 60°12\'30"N 11°05\'45"E.'}>
                  <TextArea id="points-paste" rows={4} value={pasteText} onChange={(e) => setPasteText(e.target.value)} className="font-mono" />
                </Field>
                {pasteProblems.length ? (
                  <ul role="alert" className="list-disc pl-5 text-xs font-medium text-danger" data-testid="paste-problems">
                    {pasteProblems.map((p) => (
                      <li key={p}>{p}</li>
                    ))}
                  </ul>
                ) : null}
                <Button variant="secondary" onClick={applyPasted} disabled={pasteText.trim() === ''}>
                  Use these points
                </Button>
              </div>
            </div>
          )}
          <FieldProblem message={errorAt('route')} />
        </Section>

        <Section title="Cruise">
          <ModeSwitch
            legend="Cruise profile"
            name="cruiseMode"
            value={values.cruiseMode}
            options={[
              ['level', 'One flight level'],
              ['steps', 'Step climbs'],
            ]}
            onChange={(v) => setValue('cruiseMode', v, { shouldValidate: formState.isSubmitted })}
          />
          {values.cruiseMode === 'level' ? (
            <Field id="flightLevel" label="Flight level" hint="Hundreds of feet on 1013.25 hPa, such as 350 for FL350." error={errorAt('flightLevel')} className="max-w-xs">
              <div className="flex items-center gap-2">
                <span className="text-sm font-medium text-ink-soft">FL</span>
                <TextInput id="flightLevel" inputMode="numeric" invalid={!!errorAt('flightLevel')} {...register('flightLevel')} />
              </div>
            </Field>
          ) : (
            <div className="space-y-3" data-testid="step-rows">
              {steps.fields.map((f, i) => (
                <div key={f.id} className="flex items-start gap-2" data-testid="step-row">
                  {i === 0 ? (
                    <div className="min-w-0 flex-1 space-y-1">
                      <span className="block text-sm font-medium text-ink">From</span>
                      <p className="py-2 text-sm text-ink-soft">departure (0 {u.distance})</p>
                    </div>
                  ) : (
                    <div className="min-w-0 flex-1 space-y-2">
                      <Field id={`steps-${i}-from`} label={`Step ${i} starts at (${u.distance})`}
                        hint={values.steps[i]?.at ? 'Placed at the waypoint below.' : `Distance from departure in ${u.distance}.`} error={errorAt(`steps.${i}.from`)}>
                        <TextInput id={`steps-${i}-from`} inputMode="decimal" disabled={!!values.steps[i]?.at} invalid={!!errorAt(`steps.${i}.from`)} {...register(`steps.${i}.from`)} />
                      </Field>
                      {stepWaypoints.length ? (
                        <Field id={`steps-${i}-at`} label={`or step ${i} at a waypoint`}>
                          <SelectInput id={`steps-${i}-at`} {...register(`steps.${i}.at`)}>
                            <option value="">No: at the distance above</option>
                            {stepWaypoints.map((w) => (
                              <option key={w.index} value={w.index}>
                                {w.label}
                              </option>
                            ))}
                          </SelectInput>
                        </Field>
                      ) : null}
                    </div>
                  )}
                  <Field id={`steps-${i}-flightLevel`} label={i === 0 ? 'Initial flight level' : `Step ${i} flight level`} error={errorAt(`steps.${i}.flightLevel`)} className="min-w-0 flex-1">
                    <TextInput id={`steps-${i}-flightLevel`} inputMode="numeric" invalid={!!errorAt(`steps.${i}.flightLevel`)} {...register(`steps.${i}.flightLevel`)} />
                  </Field>
                  {i > 0 ? (
                    <Button variant="ghost" className="mt-6" onClick={() => steps.remove(i)} aria-label={`Remove step ${i}`}>
                      Remove
                    </Button>
                  ) : (
                    <span className="hidden w-[74px] shrink-0 sm:block" aria-hidden />
                  )}
                </div>
              ))}
              <FieldProblem message={errorAt('steps')} />
              <Button
                variant="secondary"
                onClick={() => {
                  const last = values.steps[values.steps.length - 1];
                  const fl = Number(last?.flightLevel);
                  steps.append({ from: '', flightLevel: Number.isFinite(fl) ? String(Math.min(660, fl + 20)) : '', at: '' });
                }}
                disabled={steps.fields.length >= 50}
              >
                Add a step climb
              </Button>
            </div>
          )}
          <Field
            id="mach"
            label="Cruise Mach (optional)"
            hint={selectedAircraft && values.emissionMode === 'aircraft' ? `Blank: the type's typical Mach ${selectedAircraft.typicalMach}.` : 'Blank: Mach 0.80. Used for timing along the route.'}
            error={errorAt('mach')}
            className="max-w-xs"
          >
            <TextInput id="mach" inputMode="decimal" placeholder={selectedAircraft && values.emissionMode === 'aircraft' ? String(selectedAircraft.typicalMach) : '0.80'} invalid={!!errorAt('mach')} {...register('mach')} />
          </Field>
        </Section>

        <Section title="Fuel and emission">
          <Field id="fuelBurn" label={`Cruise fuel burn (${u.mass})`} hint="Fuel burned along the entered track at cruise; climb and descent are not modelled." error={errorAt('fuelBurn')} className="max-w-xs">
            <TextInput id="fuelBurn" inputMode="decimal" invalid={!!errorAt('fuelBurn')} {...register('fuelBurn')} />
          </Field>
          <ModeSwitch
            legend="EI NOx"
            name="emissionMode"
            value={values.emissionMode}
            options={[
              ['aircraft', 'From the aircraft type'],
              ['engine', 'From an engine'],
              ['direct', 'Given directly'],
            ]}
            onChange={(v) => setValue('emissionMode', v, { shouldValidate: formState.isSubmitted })}
          />
          {values.emissionMode === 'aircraft' ? (
            aircraft.length ? (
              <Field
                id="aircraft"
                label="Aircraft type"
                hint={
                  selectedAircraft
                    ? selectedAircraft.engineName
                      ? `${selectedAircraft.engineCount} × ${selectedAircraft.engineName}; typical FL${selectedAircraft.typicalFlightLevel}, Mach ${selectedAircraft.typicalMach}.`
                      : selectedAircraft.directEiGPerKg !== null
                        ? `Cruise EI NOx ${selectedAircraft.directEiGPerKg} g/kg given for the type; typical FL${selectedAircraft.typicalFlightLevel}.`
                        : 'This type has no engine or EI yet: add one under Engines & aircraft.'
                    : undefined
                }
                error={errorAt('aircraft')}
              >
                <SelectInput
                  id="aircraft"
                  invalid={!!errorAt('aircraft')}
                  {...register('aircraft', {
                    onChange: (e: { target: { value: string } }) => {
                      const type = aircraft.find((a) => a.code === e.target.value);
                      if (type && !form.getFieldState('flightLevel').isDirty) setValue('flightLevel', String(type.typicalFlightLevel));
                    },
                  })}
                >
                  <option value="">Choose an aircraft type…</option>
                  {aircraft.map((a) => (
                    <option key={a.code} value={a.code}>
                      {a.code}
                      {a.name ? ` — ${a.name}` : ''}
                    </option>
                  ))}
                </SelectInput>
              </Field>
            ) : (
              <Notice tone="info">No aircraft types in this workspace yet. Add one under Engines &amp; aircraft, or choose an engine or give the EI NOx.</Notice>
            )
          ) : null}
          {values.emissionMode === 'engine' ? (
            engines.length ? (
              <div className="grid gap-3 sm:grid-cols-[minmax(0,1fr)_10rem]">
                <Field id="engineId" label="Engine (certification data)" error={errorAt('engineId')}>
                  <SelectInput id="engineId" invalid={!!errorAt('engineId')} {...register('engineId')}>
                    <option value="">Choose an engine…</option>
                    {engines.map((e) => (
                      <option key={e.id} value={e.id}>
                        {e.name}
                      </option>
                    ))}
                  </SelectInput>
                </Field>
                <Field id="engineCount" label="Engines" error={errorAt('engineCount')}>
                  <TextInput id="engineCount" inputMode="numeric" invalid={!!errorAt('engineCount')} {...register('engineCount')} />
                </Field>
              </div>
            ) : (
              <Notice tone="info">No engines in this workspace yet. Add one under Engines &amp; aircraft, or give the EI NOx.</Notice>
            )
          ) : null}
          {showMethod ? (
            <Field id="method" label="Fuel-flow method" hint="Both are worked out; this one gives the figures, the other is shown beside it." className="max-w-sm">
              <SelectInput id="method" {...register('method')}>
                <option value="bffm2">Boeing Fuel Flow Method 2</option>
                <option value="dlr">DLR fuel-flow method</option>
              </SelectInput>
            </Field>
          ) : null}
          {values.emissionMode === 'direct' ? (
            <Field id="eiNox" label="Cruise EI NOx (g NO2 per kg fuel)" hint="A measured or published cruise value; preferred above Mach 1." error={errorAt('eiNox')} className="max-w-xs">
              <TextInput id="eiNox" inputMode="decimal" invalid={!!errorAt('eiNox')} {...register('eiNox')} />
            </Field>
          ) : null}
        </Section>

        <Section title="Date and tropopause">
          <div className="grid gap-3 sm:grid-cols-2">
            <Field id="flightDate" label="Flight date" hint="Its month picks the seasonal tropopause height at each latitude." error={errorAt('flightDate')}>
              <TextInput id="flightDate" type="date" invalid={!!errorAt('flightDate')} {...register('flightDate')} />
            </Field>
            <Field id="month" label="Month for the tropopause" hint="Without a date or month, the annual mean is used." error={errorAt('month')}>
              <SelectInput id="month" invalid={!!errorAt('month')} {...register('month')}>
                <option value="">From the flight date</option>
                {MONTHS.map((m, i) => (
                  <option key={m} value={i + 1}>
                    {m}
                  </option>
                ))}
              </SelectInput>
            </Field>
          </div>
          <ModeSwitch
            legend="Tropopause"
            name="tropopauseMode"
            value={values.tropopauseMode}
            options={[
              ['climatology', 'By latitude and month'],
              ['altitude', 'Altitude'],
              ['pressure', 'Pressure'],
              ['sounding', 'Stored sounding'],
            ]}
            onChange={(v) => setValue('tropopauseMode', v, { shouldValidate: formState.isSubmitted })}
          />
          {values.tropopauseMode === 'climatology' ? (
            <p className="text-xs text-ink-soft">A climatological tropopause by latitude and season along the whole route (typical error about 0.9 km).</p>
          ) : null}
          {values.tropopauseMode === 'altitude' ? (
            <Field id="tropopauseAltitude" label={`Tropopause altitude (${u.altitude})`} hint="Taken as a pressure altitude and used along the whole route." error={errorAt('tropopauseAltitude')} className="max-w-xs">
              <TextInput id="tropopauseAltitude" inputMode="decimal" invalid={!!errorAt('tropopauseAltitude')} {...register('tropopauseAltitude')} />
            </Field>
          ) : null}
          {values.tropopauseMode === 'pressure' ? (
            <Field id="tropopausePressure" label="Tropopause pressure (hPa)" hint="Used along the whole route." error={errorAt('tropopausePressure')} className="max-w-xs">
              <TextInput id="tropopausePressure" inputMode="decimal" invalid={!!errorAt('tropopausePressure')} {...register('tropopausePressure')} />
            </Field>
          ) : null}
          {values.tropopauseMode === 'sounding' ? (
            soundings.length ? (
              <Field
                id="soundingId"
                label="Stored sounding"
                hint={
                  selectedSounding
                    ? selectedSounding.tropopause
                      ? `Its tropopause: ${formatAltitude(selectedSounding.tropopause.altitudeM, units)}, ${formatNumber(selectedSounding.tropopause.pressureHpa, 0)} hPa; used along the whole route.`
                      : 'No lapse-rate tropopause was found in this sounding.'
                    : 'Its lapse-rate tropopause is used along the whole route.'
                }
                error={errorAt('soundingId')}
              >
                <SelectInput id="soundingId" invalid={!!errorAt('soundingId')} {...register('soundingId')}>
                  <option value="">Choose a sounding…</option>
                  {soundings.map((s) => (
                    <option key={s.id} value={s.id}>
                      {s.name}
                      {s.station ? ` — ${s.station}` : ''}
                      {s.observedAt ? `, ${s.observedAt.slice(0, 16).replace('T', ' ')}` : ''}
                    </option>
                  ))}
                </SelectInput>
              </Field>
            ) : (
              <Notice tone="info">No soundings stored yet. Upload one under Soundings, or give the tropopause altitude or pressure.</Notice>
            )
          ) : null}
        </Section>

        <AssumptionFields register={register} defaults={defaults} errorAt={errorAt} />

        <Section title="Save">
          <Field id="name" label="Name (optional)" hint="Shown in the screenings list; the route is used when blank." error={errorAt('name')}>
            <TextInput id="name" invalid={!!errorAt('name')} {...register('name')} />
          </Field>
          {saveError ? (
            <Notice tone="danger" role="alert">
              {saveError}
            </Notice>
          ) : null}
          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit" disabled={formState.isSubmitting || saved}>
              {formState.isSubmitting || saved ? 'Saving…' : 'Save screening'}
            </Button>
            <p className="text-xs text-ink-soft">Saving counts one screened flight towards this month&apos;s usage.</p>
          </div>
        </Section>
        <PreviewSummary
          units={units}
          data={preview.data}
          status={waitingFor.length ? 'Waiting for complete input' : previewGeneral ? 'Preview not updated' : preview.isFetching || payload !== settled ? 'Updating…' : preview.data ? 'Up to date' : 'Preview'}
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
        />
      </div>
    </div>
  );
}
