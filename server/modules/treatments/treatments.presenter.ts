import type { Withdrawal } from '../../../shared/schemas/treatments.schema';
import type { Treatment } from '../../db/entities';

export const presentTreatment = (t: Treatment, withdrawal: Withdrawal) => ({
  id: t.id,
  unitId: t.unitId,
  product: t.product,
  productName: t.productName,
  dose: t.dose,
  doseUnit: t.doseUnit,
  startsAt: t.startsAt.toISOString(),
  endsAt: t.endsAt?.toISOString() ?? null,
  withdrawalDays: t.withdrawalDays,
  withdrawalDegreeDays: t.withdrawalDegreeDays,
  withdrawal,
  note: t.note,
  createdById: t.createdById,
  createdAt: t.createdAt.toISOString(),
});
