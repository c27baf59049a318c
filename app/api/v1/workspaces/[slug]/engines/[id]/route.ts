import { libraryItemRoutes } from '@/lib/api/library-routes';
import { deleteEngine, engineSaveOf, getEngine, updateEngine } from '@/db/engines';
import { engineSaveSchema } from '@/lib/validation/library';

const api = libraryItemRoutes(getEngine, engineSaveOf, engineSaveSchema, updateEngine, deleteEngine);

export const GET = api.GET;

/** Changes any of name, fuelFlowKgS, eiNoxGPerKg, source (the four-value lists are replaced whole). */
export const PATCH = api.PATCH;

/** 204; 409 while an aircraft type uses the engine. */
export const DELETE = api.DELETE;
