import { libraryItemRoutes } from '@/lib/api/library-routes';
import { aircraftTypeSaveOf, deleteAircraftType, getAircraftType, updateAircraftType } from '@/db/engines';
import { aircraftTypeSaveSchema } from '@/lib/validation/library';

const api = libraryItemRoutes(
  getAircraftType,
  aircraftTypeSaveOf,
  aircraftTypeSaveSchema,
  updateAircraftType,
  deleteAircraftType,
);

export const GET = api.GET;

/**
 * Changes any field; the rest is kept. Switching between an engine and a direct EI NOx means sending
 * both (`{ engineId: null, directEiGPerKg: 12 }`).
 */
export const PATCH = api.PATCH;

export const DELETE = api.DELETE;
