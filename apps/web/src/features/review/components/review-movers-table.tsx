import type { ReviewMover, WeeklyReview } from '@turnstone/contracts/review';
import { formatNumber } from '@turnstone/contracts/number-format';
import { unitText } from '@turnstone/contracts/units';
import { formatPercent, formatSigned } from '../utils/format-review.ts';
import { RiseMark } from './rise-mark.tsx';
import {
  ActionCell,
  actionHead,
  Empty,
  PointCell,
  ReviewSection,
  td,
  tdNum,
  th,
  thNum,
  type OnCreateFinding,
} from './review-table-parts.tsx';

const criticalityText = {
  high: 'High criticality',
  medium: 'Medium criticality',
  low: 'Low criticality',
};

/** A weekly mean with the number of values it is the mean of. */
function Mean({ value, count, unit }: { value: number; count: number; unit: string }) {
  return (
    <>
      {formatNumber(value)} <span className="text-ink-muted">{unitText(unit)}</span>
      <div className="text-xs text-ink-muted">
        {count} {count === 1 ? 'value' : 'values'}
      </div>
    </>
  );
}

/** The noise threshold in words, as the screen and the printout state it. */
export function noiseText(r: WeeklyReview): string {
  return `A rise counts only when this week’s mean is at least ${r.noise.minChangePercent} % above last week’s and each week has at least ${r.noise.minValues} values.`;
}

/** Rising bands grouped by machine: most critical machine first, then the largest rise. */
export function MoversTable({
  review,
  onCreateFinding,
}: {
  review: WeeklyReview;
  onCreateFinding: OnCreateFinding;
}) {
  const byMachine = new Map<number, ReviewMover[]>();
  for (const m of review.movers) {
    const list = byMachine.get(m.machineId) ?? [];
    list.push(m);
    byMachine.set(m.machineId, list);
  }
  const below = review.summary.moversBelowThreshold;
  const cols = onCreateFinding ? 7 : 6;
  return (
    <ReviewSection
      id="movers"
      title="Rising bands by machine"
      count={review.summary.movers}
      description={
        <>
          {noiseText(review)}
          {below > 0 && ` ${below} smaller ${below === 1 ? 'rise' : 'rises'} left out.`}
        </>
      }
    >
      {review.movers.length === 0 ? (
        <Empty>No band rose above the noise threshold against last week.</Empty>
      ) : (
        <div className="review-scroll overflow-x-auto">
          <table className="review-table w-full border-collapse">
            <thead className="bg-sunken/60">
              <tr>
                <th className={th}>Point</th>
                <th className={th}>Band</th>
                <th className={thNum}>Last week mean</th>
                <th className={thNum}>This week mean</th>
                <th className={thNum}>Change</th>
                <th className={thNum}>Change %</th>
                {actionHead(Boolean(onCreateFinding))}
              </tr>
            </thead>
            {review.machineGroups.map((g) => {
              const rows = byMachine.get(g.machineId) ?? [];
              if (rows.length === 0) return null;
              return (
                <tbody
                  key={g.machineId}
                  className="divide-y divide-line border-t border-line-strong"
                  data-machine-group={g.machineName}
                >
                  <tr className="bg-sunken/40">
                    <th scope="rowgroup" colSpan={cols} className={`${th} text-ink`}>
                      <span className="text-[13px] font-semibold">{g.machineName}</span>
                      <span className="ml-2 font-normal text-ink-muted">
                        {g.siteCode} · {criticalityText[g.criticality]} · {g.movers} rising{' '}
                        {g.movers === 1 ? 'band' : 'bands'} · worst{' '}
                        {formatPercent(g.worstChangePercent)}
                      </span>
                    </th>
                  </tr>
                  {rows.map((m) => (
                    <tr key={`${m.pointId}-${m.bandKey}`}>
                      <PointCell row={m} />
                      <td className={td}>{m.bandName}</td>
                      <td className={tdNum}>
                        <Mean value={m.lastWeekMean} count={m.lastWeekCount} unit={m.unit} />
                      </td>
                      <td className={tdNum}>
                        <Mean value={m.thisWeekMean} count={m.thisWeekCount} unit={m.unit} />
                      </td>
                      <td className={tdNum}>
                        {formatSigned(m.change)}{' '}
                        <span className="text-ink-muted">{unitText(m.unit)}</span>
                      </td>
                      <td className={`${tdNum} font-semibold`}>
                        <RiseMark />
                        {formatPercent(m.changePercent)}
                      </td>
                      <ActionCell
                        label={`Create finding for ${m.pointTag}, ${m.bandName}`}
                        onClick={
                          onCreateFinding &&
                          (() =>
                            onCreateFinding({
                              pointId: m.pointId,
                              pointTag: m.pointTag,
                              bandKey: m.bandKey,
                              title: `${m.machineName}: ${m.bandName} up ${formatPercent(m.changePercent)} at ${m.pointTag}`,
                              context: `${m.pointTag} · ${m.bandName}: ${formatNumber(m.lastWeekMean)} (${m.lastWeekCount} values) → ${formatNumber(m.thisWeekMean)} ${unitText(m.unit)} (${m.thisWeekCount} values), ${formatPercent(m.changePercent)}`,
                            }))
                        }
                      />
                    </tr>
                  ))}
                </tbody>
              );
            })}
          </table>
        </div>
      )}
    </ReviewSection>
  );
}
