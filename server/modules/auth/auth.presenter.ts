import type { MeResponse } from '../../../shared/schemas/auth.schema';
import { displayPrefsSchema } from '../../../shared/schemas/auth.schema';
import type { Farm, User } from '../../db/entities';

export function presentMe(user: User, farms: Array<{ farm: Farm; role: string }>): MeResponse {
  return {
    user: {
      id: user.id,
      email: user.email,
      name: user.name,
      locale: user.locale,
      isAdmin: user.isAdmin,
      prefs: displayPrefsSchema.parse(user.prefs ?? {}),
    },
    farms: farms.map(({ farm, role }) => ({
      id: farm.id,
      name: farm.name,
      slug: farm.slug,
      timeZone: farm.timeZone,
      role: role as MeResponse['farms'][number]['role'],
    })),
  };
}
