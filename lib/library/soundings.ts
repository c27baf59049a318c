import 'server-only';
import { writeTx } from '@/db/client';
import { insertSounding, type SoundingDto, type SoundingLevelDto } from '@/db/soundings';
import type { LibraryActor } from '@/db/engines';
import { tropopauseFromSounding } from '@/lib/screening';
import type { SoundingCreate } from '@/lib/validation/library';

/**
 * Stores a sounding with its WMO tropopause, found once here by the engine before the write. Levels
 * that do not fit together (altitudes not rising as pressures fall) are a 422 at `levels.N`, nothing saved.
 */
export async function createSounding(
  scope: { workspaceId: number },
  input: SoundingCreate,
  by: LibraryActor,
): Promise<SoundingDto> {
  const levels: SoundingLevelDto[] = input.levels.map((l) => ({
    ...(l.altitudeM !== undefined ? { altitudeM: l.altitudeM } : {}),
    ...(l.pressureHpa !== undefined ? { pressureHpa: l.pressureHpa } : {}),
    temperatureK: l.temperatureK,
  }));
  const tropopause = tropopauseFromSounding(levels);
  return writeTx((trx) =>
    insertSounding(
      trx,
      scope,
      { name: input.name, station: input.station, observedAt: input.observedAt, levels, tropopause },
      by,
    ),
  );
}
