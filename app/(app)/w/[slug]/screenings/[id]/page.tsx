import { Suspense } from 'react';
import Form from 'next/form';
import { notFound } from 'next/navigation';
import { requireMember } from '@/lib/auth/guards';
import { can } from '@/lib/auth/policy';
import { listRescreensOf } from '@/db/screenings';
import { getScreening, routeLabel } from '@/lib/screening-service/saved';
import {
  ENGINE_VERSION,
  compareValidated,
  inputAsScreened,
  DEFAULT_FUEL_PENALTY_PCT_PER_1000_FT,
  DEFAULT_MAX_FUEL_PENALTY_PCT,
  DEFAULT_MINIMISE,
  type CruiseLevelRow,
  type MinimiseCriterion,
} from '@/lib/screening';
import { compareCruiseLevelsOptionsSchema } from '@/lib/validation/screening';
import { AppError } from '@/lib/errors';
import { formatDate, formatDateTime } from '@/lib/format';
import { Card, PageHeader } from '@/components/ui/card';
import { ButtonLink, buttonClass } from '@/components/ui/button';
import { Field, SelectInput, TextInput } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { HeadlineFigures } from '@/components/screening/headline-figures';
import { ScreeningCautions } from '@/components/screening/cautions';
import { WhatIfTable } from '@/components/screening/what-if-table';
import { SegmentTable } from '@/components/screening/segment-table';
import { AssumptionsList } from '@/components/screening/assumptions-list';
import { profileSeries } from '@/components/screening/profile-series';
import { cruiseLabel, mapPointsFor, tropopauseMonthLabel } from '@/components/screening/describe';
import { VerticalProfileChart } from '@/components/charts/vertical-profile-chart';
import { RouteMap } from '@/components/maps/route-map';
import { CardSkeleton } from '@/components/screening/skeletons';
import { UncertaintyDriversChart } from '@/components/screening/uncertainty-drivers';
import { MonthStrip } from '@/components/screening/month-strip';
import { monthsFor, uncertaintyFor } from '@/lib/screening-service/uncertainty-view';
import type { ScreeningResult } from '@/lib/screening';
import type { ScreeningInput } from '@/lib/validation/screening';
import type { UnitSystem } from '@/lib/units';
import { RescreenButton } from '@/components/screening/rescreen-button';
import Link from 'next/link';
import { rescreenScreeningAction } from './actions';

export const metadata = { title: 'Screening result' };

type Search = Record<string, string | string[] | undefined>;

const one = (v: string | string[] | undefined): string | undefined => (Array.isArray(v) ? v[0] : v);

function readWhatIf(search: Search): {
  limit: number;
  rate: number;
  minimise: MinimiseCriterion;
  problems: Record<string, string>;
  raw: { limit: string; rate: string };
} {
  const raw = { limit: one(search.limit) ?? '', rate: one(search.rate) ?? '' };
  const minimise: MinimiseCriterion =
    one(search.minimise) === 'nox-above-tropopause' ? 'nox-above-tropopause' : DEFAULT_MINIMISE;
  const problems: Record<string, string> = {};
  const candidate: Record<string, number> = {};
  if (raw.limit.trim() !== '') candidate.maxFuelPenaltyPct = Number(raw.limit);
  if (raw.rate.trim() !== '') candidate.fuelPenaltyPctPer1000Ft = Number(raw.rate);
  const parsed = compareCruiseLevelsOptionsSchema.safeParse(candidate);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const key = issue.path[0] === 'maxFuelPenaltyPct' ? 'limit' : 'rate';
      problems[key] = issue.message;
    }
  }
  const ok = parsed.success ? parsed.data : {};
  return {
    limit: problems.limit ? DEFAULT_MAX_FUEL_PENALTY_PCT : (ok.maxFuelPenaltyPct ?? DEFAULT_MAX_FUEL_PENALTY_PCT),
    rate: problems.rate
      ? DEFAULT_FUEL_PENALTY_PCT_PER_1000_FT
      : (ok.fuelPenaltyPctPer1000Ft ?? DEFAULT_FUEL_PENALTY_PCT_PER_1000_FT),
    minimise,
    problems,
    raw,
  };
}

export default async function ScreeningResultPage({
  params,
  searchParams,
}: {
  params: Promise<{ slug: string; id: string }>;
  searchParams: Promise<Search>;
}) {
  const [{ slug, id }, search] = await Promise.all([params, searchParams]);
  const { workspace, user, role } = await requireMember(slug, 'flights:read');
  if (!/^\d{1,12}$/.test(id)) notFound();
  let record;
  try {
    record = await getScreening({ workspaceId: workspace.id }, Number(id));
  } catch (err) {
    if (err instanceof AppError && err.status === 404) notFound();
    throw err;
  }
  const { input, result } = record;
  const rescreens = await listRescreensOf({ workspaceId: workspace.id }, record.id);
  const outdated = record.engineVersion !== ENGINE_VERSION;
  const current = rescreens.find((r) => r.engineVersion === ENGINE_VERSION);
  const units = user.units;
  const bands = uncertaintyFor(input, result);
  const series = profileSeries(result.segments, units);
  const points = mapPointsFor(input, result);
  const label = routeLabel(input);
  const exportBase = `/api/v1/workspaces/${slug}/screenings/${record.id}/export`;
  const facts = [
    label,
    record.aircraftCode ? `aircraft ${record.aircraftCode}` : null,
    cruiseLabel(input),
    tropopauseMonthLabel(input, result, formatDate),
    `saved ${formatDateTime(record.createdAt)}`,
  ].filter(Boolean);

  return (
    <>
      <PageHeader
        title={record.name}
        lead={facts.join(' · ')}
        actions={
          <>
            <a className={buttonClass('secondary')} href={`${exportBase}?format=csv`} download>
              Export CSV
            </a>
            <a className={buttonClass('secondary')} href={`${exportBase}?format=json`} download>
              Export JSON
            </a>
            {can(role, 'screenings:create') ? (
              <ButtonLink href={`/w/${slug}/screen`}>Screen another flight</ButtonLink>
            ) : null}
          </>
        }
      />
      <div className="space-y-6">
        {outdated ? (
          <div data-testid="engine-version-notice">
            <Notice tone="caution" title={`Made with an older engine version (${record.engineVersion})`}>
              <p>
                These figures were saved with engine version {record.engineVersion}; the current method is{' '}
                {ENGINE_VERSION}. They stay as saved.{' '}
                {current ? (
                  <>
                    It has been screened again with the current method:{' '}
                    <Link className="underline" href={`/w/${slug}/screenings/${current.id}`}>
                      screening #{current.id}
                    </Link>
                    .
                  </>
                ) : can(role, 'screenings:create') ? (
                  'Screening it again with the current method makes a new screening beside this one; it is not billed again.'
                ) : null}
              </p>
              {!current && can(role, 'screenings:create') ? (
                <RescreenButton slug={slug} onRescreen={rescreenScreeningAction.bind(null, slug, record.id)} />
              ) : null}
            </Notice>
          </div>
        ) : null}
        {record.rescreenOf !== null ? (
          <p className="text-sm text-ink-soft">
            Screened again with engine version {record.engineVersion} from{' '}
            <Link className="underline" href={`/w/${slug}/screenings/${record.rescreenOf}`}>
              screening #{record.rescreenOf}
            </Link>
            ; not billed again.
          </p>
        ) : null}
        <ScreeningCautions cautions={result.cautions} />
        <HeadlineFigures result={result} units={units} bands={bands} />
        <Suspense fallback={<CardSkeleton label="the spread and the months" />}>
          <SpreadAndSeason input={input} result={result} units={units} />
        </Suspense>
        <div className="grid gap-6 xl:grid-cols-2">
          <Card title="Vertical profile">
            <VerticalProfileChart series={series} label={`Cruise altitude and tropopause along ${label}`} />
          </Card>
          <Card title="Route">
            <RouteMap
              points={points}
              segments={result.segments}
              title={`Map of ${label}, coloured by position against the tropopause`}
            />
          </Card>
        </div>
        <Suspense fallback={<CardSkeleton label="the other cruise levels" />}>
          <WhatIfSection
            input={inputAsScreened(input, result.flightPlan)}
            search={search}
            units={units}
            engineVersion={record.engineVersion}
          />
        </Suspense>
        <Card title="Segments">
          <div id="segments">
            <SegmentTable segments={result.segments} units={units} />
          </div>
        </Card>
        <Card title="How these figures were made">
          <AssumptionsList result={result} />
        </Card>
      </div>
    </>
  );
}

/** The what-if levels, worked out now from the saved input with the planner's fuel-penalty limit from the URL. */
async function WhatIfSection({
  input,
  search,
  units,
  engineVersion,
}: {
  input: ScreeningInput;
  search: Search;
  units: UnitSystem;
  engineVersion: string;
}) {
  const whatIf = readWhatIf(search);
  let levels: CruiseLevelRow[] | null = null;
  try {
    levels = compareValidated(input, {
      maxFuelPenaltyPct: whatIf.limit,
      fuelPenaltyPctPer1000Ft: whatIf.rate,
      minimise: whatIf.minimise,
    });
  } catch {
    levels = null;
  }
  const keep = Object.entries(search).filter(([k]) => k === 'seg_sort' || k === 'seg_page');
  return (
    <Card title="Other cruise levels">
      <Form action="" className="mb-4 flex flex-wrap items-end gap-3" scroll={false}>
        {keep.map(([k, v]) => (
          <input key={k} type="hidden" name={k} value={one(v) ?? ''} />
        ))}
        <Field id="limit" label="Fuel-penalty limit (%)" error={whatIf.problems.limit} className="w-48">
          <TextInput
            id="limit"
            name="limit"
            inputMode="decimal"
            defaultValue={whatIf.raw.limit || String(whatIf.limit)}
            invalid={!!whatIf.problems.limit}
          />
        </Field>
        <Field id="rate" label="Penalty per 1000 ft (%)" error={whatIf.problems.rate} className="w-48">
          <TextInput
            id="rate"
            name="rate"
            inputMode="decimal"
            defaultValue={whatIf.raw.rate || String(whatIf.rate)}
            invalid={!!whatIf.problems.rate}
          />
        </Field>
        <Field id="minimise" label="Mark the level with the least" className="w-64">
          <SelectInput id="minimise" name="minimise" defaultValue={whatIf.minimise}>
            <option value="ozone-figure">ozone figure (gross loss)</option>
            <option value="nox-above-tropopause">NOx above the tropopause</option>
          </SelectInput>
        </Field>
        <button type="submit" className={buttonClass('secondary')}>
          Compare levels
        </button>
      </Form>
      {levels ? (
        <WhatIfTable rows={levels} units={units} limitPct={whatIf.limit} ratePctPer1000Ft={whatIf.rate} />
      ) : (
        <Notice tone="danger">
          The other levels could not be worked out for this saved input with the current methods.
        </Notice>
      )}
      <p className="mt-2 text-xs text-ink-soft">
        Worked out now from the saved input; the figures above are as saved (engine version {engineVersion}).
      </p>
    </Card>
  );
}

/** What moves each figure (from the sampling) and the flight in every month. */
async function SpreadAndSeason({
  input,
  result,
  units,
}: {
  input: ScreeningInput;
  result: ScreeningResult;
  units: UnitSystem;
}) {
  const u = uncertaintyFor(input, result);
  const months = monthsFor(input);
  return (
    <div className="space-y-6">
      <Card title="What moves these figures">
        {u ? (
          <>
            <UncertaintyDriversChart drivers={u.drivers} />
            <p className="mt-3 text-xs text-ink-soft">
              5–95 %: percentiles of {u.samples} samples (seed {u.seed}) of the inputs that are really uncertain; the
              screening range keeps every input at its low or high end together.{' '}
              {u.outsideScreeningRange.length
                ? `The ozone ${u.outsideScreeningRange.join(', ')} lie outside the screening range: the tropopause height or the EI, which that range holds fixed, moves them there.`
                : ''}
            </p>
          </>
        ) : (
          <Notice tone="info">
            This screening was saved by an earlier engine version ({result.engineVersion}); screen it again to see the
            spread.
          </Notice>
        )}
      </Card>
      <Card title="Across the year">
        {months ? (
          <MonthStrip rows={months.rows} plannedMonth={result.month} units={units} note={months.note} />
        ) : (
          <Notice tone="info">The months could not be worked out for this saved input with the current methods.</Notice>
        )}
      </Card>
    </div>
  );
}
