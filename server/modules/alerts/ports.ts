import { defaultFarmSettings, type FarmSettings } from '../../db/entities';

/** What the alerts, on-call and reports modules need to know about a farm. */
export type FarmInfo = { id: string; name: string; timeZone: string; settings: FarmSettings };

/** Farm look-ups. The farms module's FarmsService is adapted to this in server/container.ts (farmDirectoryFrom). */
export type FarmDirectory = {
  farm(farmId: string): Promise<FarmInfo | null>;
  allFarms(): Promise<FarmInfo[]>;
};

type FarmDtoLike = { id: string; name: string; timeZone: string; settings: Partial<FarmSettings> };

/** Adapts a farms service (get / listFor) to the FarmDirectory the alerts modules use. */
export function farmDirectoryFrom(farms: {
  get(farmId: string, role: 'admin'): Promise<FarmDtoLike>;
  listFor(viewer: { isAdmin: boolean; memberships: Map<string, never> }): Promise<FarmDtoLike[]>;
}): FarmDirectory {
  const info = (f: FarmDtoLike): FarmInfo => ({ id: f.id, name: f.name, timeZone: f.timeZone, settings: { ...defaultFarmSettings, ...f.settings } });
  return {
    async farm(farmId) {
      try {
        return info(await farms.get(farmId, 'admin'));
      } catch (err) {
        if ((err as { status?: number }).status === 404) return null;
        throw err;
      }
    },
    async allFarms() {
      return (await farms.listFor({ isAdmin: true, memberships: new Map<string, never>() })).map(info);
    },
  };
}
