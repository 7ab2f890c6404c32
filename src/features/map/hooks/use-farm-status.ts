import type { UnitStatusDto } from '@shared/schemas/farms.schema';
import { useQuery } from '@tanstack/react-query';
import { useEffect, useRef, useState } from 'react';
import { useTranslation } from 'react-i18next';
import { mapQueries } from '../api/farm-status';
import { mapStatusOf } from '../lib/palette';

export function useFarmStatus(farmId: string) {
  return useQuery(mapQueries.status(farmId));
}

/**
 * A sentence for a polite live region whenever a unit's status changes between two answers
 * ("R3 Raceway 3 is now Act"), so a screen-reader user hears what a sighted user sees recolour.
 */
export function useStatusAnnouncements(units: readonly UnitStatusDto[] | undefined): string {
  const { t } = useTranslation();
  const previous = useRef<Map<string, string> | null>(null);
  const [message, setMessage] = useState('');
  useEffect(() => {
    if (!units) return;
    const now = new Map(units.map((u) => [u.id, mapStatusOf(u.status)]));
    const before = previous.current;
    previous.current = now;
    if (!before) return;
    const changed = units.filter((u) => before.has(u.id) && before.get(u.id) !== now.get(u.id));
    if (changed.length === 0) return;
    setMessage(
      changed
        .map((u) => t('map.announce', { code: u.code, name: u.name, status: u.status ? t(`status.${u.status}`) : t('map.unrated') }))
        .join(' '),
    );
  }, [units, t]);
  return message;
}
