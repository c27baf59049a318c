import type { AssumptionDefaults } from '@/components/screening/screen-form-adapter';
import type { UnitSystem } from '@/lib/units';
import type { ScreeningInputRaw, SoundingLevelInput } from '@/lib/validation/screening';

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
