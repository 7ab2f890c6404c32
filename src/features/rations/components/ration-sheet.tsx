import type { RationSheetDto } from '@shared/schemas/feed.schema';
import { useTranslation } from 'react-i18next';
import { formatDay, fmtKg } from '../lib/format';

/**
 * On paper only the sheet is printed: the app's header, navigation and footer and everything marked
 * gw-no-print are left out, and rows keep together.
 */
const printCss = `
@media print {
  @page { margin: 12mm; }
  html, body, .bg-paper { background: #fff !important; }
  header, nav, footer, .gw-no-print { display: none !important; }
  main { padding: 0 !important; margin: 0 !important; max-width: none !important; }
  .gw-ration-print { border: 0 !important; box-shadow: none !important; padding: 0 !important; }
  .gw-ration-print table { font-size: 11pt; }
  .gw-ration-print tr { break-inside: avoid; }
  .gw-ration-print th, .gw-ration-print td { border: 1px solid #000 !important; }
}
`;

export interface RationSheetProps {
  sheet: RationSheetDto;
  farmName: string;
}

/** The sheet the hands feed from: per unit what to feed (once decided), why, and blanks to write in what was fed. */
export function RationSheet({ sheet, farmName }: RationSheetProps) {
  const { t, i18n } = useTranslation();
  const locale = i18n.language;
  const rows = [...sheet.rows].sort((a, b) => a.unit.walkOrder - b.unit.walkOrder);
  const cell = 'border border-line px-3 py-2 align-top';

  return (
    <section
      className="gw-ration-print gw-card flex flex-col gap-4 p-4 sm:p-6"
      data-testid="ration-sheet"
      aria-labelledby="ration-sheet-title"
    >
      <style>{printCss}</style>
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="ration-sheet-title" className="text-2xl font-bold">
          {t('rations.sheet.title', { farm: farmName })}
        </h2>
        <p className="text-lg font-bold">{formatDay(sheet.day, locale, true)}</p>
      </div>
      <p className="text-base">{t('rations.sheet.intro')}</p>
      <div className="overflow-x-auto">
        <table className="w-full border-collapse text-base">
          <thead className="bg-abyss-50 text-left">
            <tr>
              <th scope="col" className={cell}>
                {t('rations.sheet.unit')}
              </th>
              <th scope="col" className={`${cell} w-36 text-right`}>
                {t('rations.sheet.toFeed')}
              </th>
              <th scope="col" className={cell}>
                {t('rations.sheet.why')}
              </th>
              <th scope="col" className={`${cell} w-28`}>
                {t('rations.sheet.fed')}
              </th>
              <th scope="col" className={`${cell} w-24`}>
                {t('rations.sheet.time')}
              </th>
              <th scope="col" className={`${cell} w-24`}>
                {t('rations.sheet.initials')}
              </th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => {
              const rec = r.recommendation;
              const why =
                r.status === 'overridden'
                  ? (rec?.overrideNote ?? '')
                  : r.status === 'accepted' && rec && rec.action !== 'feed'
                    ? (rec.reasons.find((x) => x.effect === 'withhold' || x.effect === 'cut')?.text ?? '')
                    : '';
              return (
                <tr key={r.unit.id} data-testid="sheet-row" data-unit-code={r.unit.code} data-status={r.status}>
                  <th scope="row" className={`${cell} text-left`}>
                    <span className="block text-lg font-bold">{r.unit.code}</span>
                    <span className="block text-sm font-normal">{r.unit.name}</span>
                  </th>
                  <td className={`${cell} text-right tabular-nums`} data-testid="sheet-to-feed">
                    {r.toFeedKg === null ? (
                      <span className="text-base text-muted">{t('rations.sheet.notDecided')}</span>
                    ) : r.toFeedKg === 0 ? (
                      <span className="text-xl font-bold">{t('rations.sheet.noFeed')}</span>
                    ) : (
                      <span className="whitespace-nowrap text-xl font-bold">{fmtKg(r.toFeedKg, locale)} kg</span>
                    )}
                  </td>
                  <td className={cell}>
                    {r.status === 'overridden' ? <span className="font-bold">{t('rations.sheet.changed')} </span> : null}
                    {why}
                  </td>
                  <td className={`${cell} tabular-nums`}>
                    {r.feeding ? (r.feeding.withheld ? t('rations.sheet.withheld') : `${fmtKg(r.feeding.fedKg, locale)} kg`) : ''}
                  </td>
                  <td className={cell} />
                  <td className={cell} />
                </tr>
              );
            })}
          </tbody>
          <tfoot>
            <tr className="bg-abyss-50">
              <th scope="row" className={`${cell} text-left`}>
                {t('rations.sheet.total')}
              </th>
              <td className={`${cell} text-right text-lg font-bold tabular-nums`}>{fmtKg(sheet.totals.approvedKg, locale)} kg</td>
              <td className={cell} colSpan={4}>
                {sheet.totals.pending > 0
                  ? t('rations.sheet.pendingCount', { count: sheet.totals.pending })
                  : t('rations.sheet.allDecided')}
              </td>
            </tr>
          </tfoot>
        </table>
      </div>
      <p className="text-sm">{t('rations.caution')}</p>
    </section>
  );
}
