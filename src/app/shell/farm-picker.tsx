import type { MeFarm } from '@shared/schemas/auth.schema';
import { useTranslation } from 'react-i18next';
import { useLocation, useNavigate } from 'react-router';
import { Select } from '@/components/ui/field';
import { farmPath } from '@/config/paths';

/** Moves to the same screen on another farm (without any ids that belong to the old farm). */
export function switchFarmPath(pathname: string, toFarmId: string): string {
  const match = /^\/farms\/[^/]+(?:\/([^/]+))?/.exec(pathname);
  const screen = match?.[1];
  const base = farmPath('home', toFarmId);
  return screen ? `${base}/${screen}` : base;
}

export function FarmPicker({ farms, currentId, className }: { farms: readonly MeFarm[]; currentId: string; className?: string }) {
  const { t } = useTranslation();
  const navigate = useNavigate();
  const { pathname } = useLocation();
  return (
    <Select
      label={t('shell.farm')}
      hideLabel
      tone="dark"
      value={currentId}
      options={farms.map((f) => ({ value: f.id, label: f.name }))}
      onChange={(e) => navigate(switchFarmPath(pathname, e.target.value))}
      containerClassName={className}
    />
  );
}
