'use client';

import { useState } from 'react';
import { Controller, useFieldArray, type UseFormReturn } from 'react-hook-form';
import { parseWaypointList, type ScreenFormValues } from '@/components/screening/screen-form-adapter';
import { Field, SelectInput, TextArea, TextInput } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { AirportCombobox } from './airport-combobox';
import { FieldProblem, ModeSwitch, Section } from './screen-form-parts';
import type { RouteChoice } from './screen-form-types';
import { FlightPlanEntry } from './flight-plan-entry';
import type { FlightPlanUsed } from '@/lib/screening';

/** The route: a saved route, airports, coordinates (typed or pasted) or a flight plan's route. */
export function RouteSection({
  slug,
  form,
  routes,
  errorAt,
  understood,
}: {
  slug: string;
  form: UseFormReturn<ScreenFormValues>;
  routes: RouteChoice[];
  errorAt: (path: string) => string | undefined;
  /** What the last preview understood of a flight-plan route. */
  understood?: FlightPlanUsed;
}) {
  const { control, register, setValue, formState } = form;
  const values = form.watch();
  const airports = useFieldArray({ control, name: 'airports' });
  const points = useFieldArray({ control, name: 'points' });
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
      points.replace(
        route.coordinates.map((c) => (c ? { lat: String(c.lat), lon: String(c.lon) } : { lat: '', lon: '' })),
      );
    }
    setRouteNote(`${route.name}: ${route.waypoints.length} points${route.notes ? `. ${route.notes}` : ''}`);
  };
  return (
    <Section title="Route">
      {routes.length ? (
        <Field
          id="saved-route"
          label="Start from a saved route"
          hint={routeNote ?? 'Fills the route below; you can still change it.'}
        >
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
          ['flightPlan', 'Flight plan'],
        ]}
        onChange={(v) => setValue('routeMode', v, { shouldValidate: formState.isSubmitted })}
      />
      {values.routeMode === 'flightPlan' ? (
        <FlightPlanEntry slug={slug} form={form} errorAt={errorAt} understood={understood} />
      ) : values.routeMode === 'airports' ? (
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
                <Button
                  variant="ghost"
                  className="mt-6"
                  onClick={() => airports.remove(i)}
                  aria-label={`Remove ${i === 0 ? 'the departure' : i === airports.fields.length - 1 ? 'the destination' : `stop ${i}`}`}
                >
                  Remove
                </Button>
              ) : null}
            </div>
          ))}
          <Button
            variant="secondary"
            onClick={() => airports.insert(airports.fields.length - 1, { code: '' })}
            disabled={airports.fields.length >= 20}
          >
            Add a stop
          </Button>
        </div>
      ) : (
        <div className="space-y-3">
          {points.fields.map((f, i) => (
            <div key={f.id} className="flex items-start gap-2" data-testid="point-row">
              <Field
                id={`points-${i}-lat`}
                label={`Point ${i + 1} latitude`}
                error={errorAt(`points.${i}.lat`)}
                className="min-w-0 flex-1"
              >
                <TextInput
                  id={`points-${i}-lat`}
                  inputMode="decimal"
                  placeholder="51.47"
                  invalid={!!errorAt(`points.${i}.lat`)}
                  {...register(`points.${i}.lat`)}
                />
              </Field>
              <Field
                id={`points-${i}-lon`}
                label="longitude"
                error={errorAt(`points.${i}.lon`)}
                className="min-w-0 flex-1"
              >
                <TextInput
                  id={`points-${i}-lon`}
                  inputMode="decimal"
                  placeholder="-0.45"
                  invalid={!!errorAt(`points.${i}.lon`)}
                  {...register(`points.${i}.lon`)}
                />
              </Field>
              {points.fields.length > 2 ? (
                <Button
                  variant="ghost"
                  className="mt-6"
                  onClick={() => points.remove(i)}
                  aria-label={`Remove point ${i + 1}`}
                >
                  Remove
                </Button>
              ) : null}
            </div>
          ))}
          <p className="text-xs text-ink-faint">
            Degrees, north and east positive. The route follows great circles between the points.
          </p>
          <Button
            variant="secondary"
            onClick={() => points.append({ lat: '', lon: '' })}
            disabled={points.fields.length >= 500}
          >
            Add a point
          </Button>
          <div className="space-y-2 rounded-md border border-dashed border-line-strong p-3">
            <Field
              id="points-paste"
              label="Or paste a list of points"
              hint={
                'One point per line, latitude first: "51.47 -0.45", "51.47N 0.45W", "6012N01105E", "60 12.5N 011 05.3E" or 60°12\'30"N 11°05\'45"E.'
              }
            >
              <TextArea
                id="points-paste"
                rows={4}
                value={pasteText}
                onChange={(e) => setPasteText(e.target.value)}
                className="font-mono"
              />
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
  );
}
