import type { ReactNode } from 'react';
import { cx } from './cx';

export interface Column<Row> {
  key: string;
  header: ReactNode;
  cell: (row: Row) => ReactNode;
  align?: 'left' | 'right' | 'center';
  /** Mark the column that names the row; it becomes the row header for screen readers. */
  rowHeader?: boolean;
}

export interface TableProps<Row> {
  columns: readonly Column<Row>[];
  rows: readonly Row[];
  rowKey: (row: Row) => string;
  caption?: ReactNode;
  /** Hide the caption visually but keep it for screen readers. */
  hideCaption?: boolean;
  empty?: ReactNode;
  className?: string;
}

const alignClass = { left: 'text-left', right: 'text-right', center: 'text-center' } as const;

export function Table<Row>({ columns, rows, rowKey, caption, hideCaption, empty, className }: TableProps<Row>) {
  if (rows.length === 0 && empty) return <>{empty}</>;
  return (
    <div className={cx('overflow-x-auto rounded-xl border-2 border-line bg-card', className)}>
      <table className="w-full border-collapse text-base">
        {caption ? (
          <caption className={cx('px-4 py-3 text-left text-lg font-bold', hideCaption && 'sr-only')}>{caption}</caption>
        ) : null}
        <thead className="bg-abyss-50">
          <tr>
            {columns.map((c) => (
              <th
                key={c.key}
                scope="col"
                className={cx('border-b-2 border-line px-4 py-3 font-bold', alignClass[c.align ?? 'left'])}
              >
                {c.header}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => (
            <tr key={rowKey(row)} className="border-b border-line last:border-b-0 even:bg-paper">
              {columns.map((c) => {
                const content = c.cell(row);
                const cls = cx('px-4 py-3', alignClass[c.align ?? 'left'], c.align === 'right' && 'tabular-nums');
                return c.rowHeader ? (
                  <th key={c.key} scope="row" className={cx(cls, 'font-bold')}>
                    {content}
                  </th>
                ) : (
                  <td key={c.key} className={cls}>
                    {content}
                  </td>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
