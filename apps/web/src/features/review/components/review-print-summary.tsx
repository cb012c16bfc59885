import {
  findingPriorityLabels,
  findingStateLabels,
  type Finding,
} from '@turnstone/contracts/findings';
import type { WeeklyReview } from '@turnstone/contracts/review';
import { formatNumber } from '@turnstone/contracts/number-format';
import { unitText } from '@turnstone/contracts/units';
import { formatDay, formatPercent } from '../utils/format-review.ts';
import { noiseText } from './review-movers-table.tsx';

/** Rows the printed summary keeps per table, so the summary stays within two A4 pages. */
export const PRINT_TOP = { machines: 6, forecasts: 8, findings: 10 } as const;

const th = 'px-1.5 py-1 text-left font-medium';
const td = 'px-1.5 py-1 align-top';

function Block({
  title,
  more,
  children,
}: {
  title: string;
  more: number;
  children: React.ReactNode;
}) {
  return (
    <section className="review-print-block">
      <h2 className="text-[11pt] font-semibold">
        {title}
        {more > 0 && <span className="font-normal"> (top rows; {more} more in the details)</span>}
      </h2>
      <table className="review-table w-full border-collapse">{children}</table>
    </section>
  );
}

/**
 * On paper only: the summary pages — top machines, forecasts and findings, each cut to its
 * top rows — before the page break that starts the details.
 */
export function ReviewPrintSummary({ review }: { review: WeeklyReview }) {
  const zones = Object.fromEntries(review.siteWeeks.map((w) => [w.siteId, w.timeZone]));
  const groups = review.machineGroups.slice(0, PRINT_TOP.machines);
  const forecasts = review.forecasts.slice(0, PRINT_TOP.forecasts);
  const seen = new Set<number>();
  const findings: Finding[] = [];
  for (const f of [...review.findingsDue, ...review.findingsCreated])
    if (!seen.has(f.id)) {
      seen.add(f.id);
      findings.push(f);
    }
  return (
    <div data-print="only" className="review-print-summary hidden">
      <Block title="Top machines by rise" more={review.machineGroups.length - groups.length}>
        <thead>
          <tr>
            <th className={th}>Machine</th>
            <th className={th}>Site</th>
            <th className={th}>Criticality</th>
            <th className={th}>Rising bands</th>
            <th className={th}>Worst rise</th>
          </tr>
        </thead>
        <tbody>
          {groups.length === 0 && (
            <tr>
              <td className={td} colSpan={5}>
                None above the noise threshold.
              </td>
            </tr>
          )}
          {groups.map((g) => (
            <tr key={g.machineId}>
              <td className={td}>{g.machineName}</td>
              <td className={td}>{g.siteCode}</td>
              <td className={td}>{g.criticality}</td>
              <td className={td}>{g.movers}</td>
              <td className={td}>{formatPercent(g.worstChangePercent)}</td>
            </tr>
          ))}
        </tbody>
      </Block>
      <p className="text-[8pt]">{noiseText(review)}</p>
      <Block
        title={`Forecasts: reaching a level within ${review.period.weeksAhead} weeks`}
        more={review.summary.forecasts - forecasts.length}
      >
        <thead>
          <tr>
            <th className={th}>Point</th>
            <th className={th}>Machine</th>
            <th className={th}>Band</th>
            <th className={th}>Level</th>
            <th className={th}>Projected</th>
          </tr>
        </thead>
        <tbody>
          {forecasts.map((f) => (
            <tr key={`${f.pointId}-${f.bandKey}`}>
              <td className={td}>{f.pointTag}</td>
              <td className={td}>{f.machineName}</td>
              <td className={td}>{f.bandName}</td>
              <td className={td}>
                {f.target.level} {formatNumber(f.target.value)} {unitText(f.unit)}
              </td>
              <td className={td}>{formatDay(f.crossingAt, zones[f.siteId])}</td>
            </tr>
          ))}
        </tbody>
      </Block>
      <Block
        title="Findings: due by the end of next week, and created this week"
        more={findings.length - Math.min(findings.length, PRINT_TOP.findings)}
      >
        <thead>
          <tr>
            <th className={th}>Finding</th>
            <th className={th}>Machine</th>
            <th className={th}>State</th>
            <th className={th}>Priority</th>
            <th className={th}>Owner</th>
            <th className={th}>Work order</th>
            <th className={th}>Due</th>
          </tr>
        </thead>
        <tbody>
          {findings.slice(0, PRINT_TOP.findings).map((f) => (
            <tr key={f.id}>
              <td className={td}>{f.title}</td>
              <td className={td}>{f.machineName}</td>
              <td className={td}>{findingStateLabels[f.state]}</td>
              <td className={td}>{findingPriorityLabels[f.priority]}</td>
              <td className={td}>{f.owner ?? '—'}</td>
              <td className={td}>{f.workOrderRef ?? '—'}</td>
              <td className={td}>{f.dueDate ?? '—'}</td>
            </tr>
          ))}
        </tbody>
      </Block>
    </div>
  );
}
