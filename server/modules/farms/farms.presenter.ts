import { displayPrefsSchema, type Role } from '../../../shared/schemas/auth.schema';
import type { FarmDto } from '../../../shared/schemas/farms.schema';
import { defaultFarmSettings, type Farm, type FarmSettings } from '../../db/entities';

/** Stored (partial) settings over the defaults: every field present. */
export const mergeSettings = (stored: Partial<FarmSettings> | null | undefined): FarmSettings => ({
  ...defaultFarmSettings,
  ...(stored ?? {}),
});

export function presentFarm(farm: Farm, role: Role): FarmDto {
  return {
    id: farm.id,
    slug: farm.slug,
    name: farm.name,
    timeZone: farm.timeZone,
    longitude: farm.longitude,
    latitude: farm.latitude,
    settings: mergeSettings(farm.settings),
    displayPrefs: displayPrefsSchema.parse(farm.displayPrefs ?? {}),
    role,
    createdAt: farm.createdAt.toISOString(),
    updatedAt: farm.updatedAt.toISOString(),
  };
}
