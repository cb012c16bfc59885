/** The review's table parts: a titled section, an empty state, the table frame and its cells. */

import type { ReactNode } from 'react';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { PointLabel } from '../../../components/ui/text-link.tsx';
import { formatNumber } from '@turnstone/contracts/number-format';
import { unitText } from '@turnstone/contracts/units';

/** What a "Create finding" button hands to the page: the row's point, band or alert, a title. */
export interface FindingDraft {
  pointId: number;
  pointTag: string;
  alertId?: number;
  bandKey?: string;
  title: string;
  /** One line telling where the finding comes from, shown in the form. */
  context: string;
}

export type OnCreateFinding = ((draft: FindingDraft) => void) | undefined;

export function ReviewSection({
  id,
  title,
  description,
  count,
  children,
}: {
  id: string;
  title: string;
  description: ReactNode;
  count: number;
  children: ReactNode;
}) {
  return (
    <Card className="review-section overflow-hidden">
      <section id={id} aria-labelledby={`${id}-title`} className="scroll-mt-4">
        <div className="flex flex-wrap items-baseline justify-between gap-2 border-b border-line px-4 py-3">
          <h2 id={`${id}-title`} className="text-[15px] font-semibold text-ink">
            {title} <span className="font-mono text-sm font-normal text-ink-muted">({count})</span>
          </h2>
          <p className="text-xs text-ink-muted">{description}</p>
        </div>
        {children}
      </section>
    </Card>
  );
}

export function Empty({ children }: { children: ReactNode }) {
  return <p className="px-4 py-6 text-center text-sm text-ink-muted">{children}</p>;
}

export const th = 'px-3 py-2 text-left text-xs font-medium text-ink-muted whitespace-nowrap';
export const thNum = `${th} text-right`;
export const td = 'px-3 py-2 align-top text-[13px] text-ink';
export const tdNum = `${td} text-right font-mono whitespace-nowrap`;

export function Table({ head, children }: { head: ReactNode; children: ReactNode }) {
  return (
    <div className="review-scroll overflow-x-auto">
      <table className="review-table w-full border-collapse">
        <thead className="bg-sunken/60">
          <tr>{head}</tr>
        </thead>
        <tbody className="divide-y divide-line">{children}</tbody>
      </table>
    </div>
  );
}

/** The point (link to its page) and its machine, the first cell of every row. */
export function PointCell({
  row,
}: {
  row: { pointId: number; pointTag: string; pointName: string; machineName: string };
}) {
  return (
    <td className={td}>
      <PointLabel
        pointId={row.pointId}
        title={row.pointTag}
        titleIs="tag"
        detail={`${row.machineName} · ${row.pointName}`}
      />
    </td>
  );
}

export function Value({ value, unit }: { value: number; unit: string }) {
  return (
    <>
      {formatNumber(value)} <span className="text-ink-muted">{unitText(unit)}</span>
    </>
  );
}

export function ActionCell({
  label,
  onClick,
}: {
  label: string;
  onClick: (() => void) | undefined;
}) {
  if (!onClick) return null;
  return (
    <td data-print="hide" className={`${td} text-right`}>
      <Button size="sm" onClick={onClick} aria-label={label}>
        Create finding
      </Button>
    </td>
  );
}

export const actionHead = (show: boolean) =>
  show ? (
    <th data-print="hide" className={th}>
      <span className="sr-only">Actions</span>
    </th>
  ) : null;
