import type { ReviewAlert, ReviewForecast, ReviewQualityNotice } from '@turnstone/contracts/review';

import { StatusMark } from '../../../components/ui/status-mark.tsx';
import { Button } from '../../../components/ui/button.tsx';

import { formatNumber } from '@turnstone/contracts/number-format';
import { unitText } from '@turnstone/contracts/units';
import { formatDay } from '../utils/format-review.ts';
import { formatDateTime } from '../../../lib/format.ts';

import {
  ActionCell,
  actionHead,
  Empty,
  PointCell,
  ReviewSection,
  Table,
  td,
  tdNum,
  th,
  thNum,
  Value,
  type OnCreateFinding,
} from './review-table-parts.tsx';

export function ForecastsTable({
  rows,
  total,
  weeksAhead,
  onCreateFinding,
  zones,
}: {
  rows: ReviewForecast[];
  total: number;
  weeksAhead: number;
  onCreateFinding: OnCreateFinding;
  /** Each site's time zone, by site id: dates are the site's days. */
  zones: Record<number, string>;
}) {
  return (
    <ReviewSection
      id="forecasts"
      title={`Projected to reach a level within ${weeksAhead} weeks`}
      count={total}
      description="Trend of the last six weeks (daily means) fitted and extended to the next level in force; soonest first."
    >
      {rows.length === 0 ? (
        <Empty>No point is projected to reach a level within {weeksAhead} weeks.</Empty>
      ) : (
        <Table
          head={
            <>
              <th className={th}>Point</th>
              <th className={th}>Band</th>
              <th className={thNum}>Latest</th>
              <th className={th}>Level</th>
              <th className={th}>Projected date</th>
              <th className={th}>Model</th>
              {actionHead(Boolean(onCreateFinding))}
            </>
          }
        >
          {rows.map((f) => (
            <tr key={`${f.pointId}-${f.bandKey}`}>
              <PointCell row={f} />
              <td className={td}>{f.bandName}</td>
              <td className={tdNum}>
                <Value value={f.latestValue} unit={f.unit} />
              </td>
              <td className={`${td} whitespace-nowrap`}>
                <StatusMark status={f.target.level} />{' '}
                <span className="font-mono text-xs text-ink-muted">
                  {formatNumber(f.target.value)} {unitText(f.unit)}
                  {f.levelSource === 'statistical' ? ' (baseline)' : ''}
                </span>
              </td>
              <td className={`${td} whitespace-nowrap`}>
                <span className="font-mono">{formatDay(f.crossingAt, zones[f.siteId])}</span>
                <div className="text-xs text-ink-muted">
                  {f.daysToCrossing === 0 ? 'due now' : `in ${f.daysToCrossing} days`}
                </div>
              </td>
              <td className={`${td} whitespace-nowrap`}>
                {f.model}
                <div className="font-mono text-xs text-ink-muted">R² {f.r2.toFixed(2)}</div>
              </td>
              <ActionCell
                label={`Create finding for ${f.pointTag}, ${f.bandName}`}
                onClick={
                  onCreateFinding &&
                  (() =>
                    onCreateFinding({
                      pointId: f.pointId,
                      pointTag: f.pointTag,
                      bandKey: f.bandKey,
                      title: `${f.machineName}: ${f.bandName} projected to reach ${f.target.level} by ${formatDay(f.crossingAt, zones[f.siteId])}`,
                      context: `${f.pointTag} · ${f.bandName}: ${formatNumber(f.latestValue)} ${unitText(f.unit)} now, ${f.target.level} level ${formatNumber(f.target.value)} ${unitText(f.unit)} projected ${formatDay(f.crossingAt, zones[f.siteId])} (${f.model}, R² ${f.r2.toFixed(2)})`,
                    }))
                }
              />
            </tr>
          ))}
        </Table>
      )}
    </ReviewSection>
  );
}

export function OpenAlertsTable({
  rows,
  total,
  onCreateFinding,
  zones,
}: {
  rows: ReviewAlert[];
  total: number;
  onCreateFinding: OnCreateFinding;
  /** Each site's time zone, by site id: dates are the site's days. */
  zones: Record<number, string>;
}) {
  return (
    <ReviewSection
      id="open-alerts"
      title="Open alerts by age"
      count={total}
      description="Raised or acknowledged and not yet cleared; oldest first."
    >
      {rows.length === 0 ? (
        <Empty>No open alerts.</Empty>
      ) : (
        <Table
          head={
            <>
              <th className={th}>Point</th>
              <th className={th}>Band</th>
              <th className={th}>Level</th>
              <th className={th}>State</th>
              <th className={thNum}>Last / limit</th>
              <th className={thNum}>Age</th>
              {actionHead(Boolean(onCreateFinding))}
            </>
          }
        >
          {rows.map((a) => (
            <tr key={a.alertId}>
              <PointCell row={a} />
              <td className={td}>{a.bandName}</td>
              <td className={`${td} whitespace-nowrap`}>
                <StatusMark status={a.level} />
                {a.suspect && <div className="text-xs text-ink-muted">suspect data</div>}
              </td>
              <td className={td}>{a.state === 'raised' ? 'Not acknowledged' : 'Acknowledged'}</td>
              <td className={tdNum}>
                {formatNumber(a.lastValue)} / <Value value={a.limitValue} unit={a.unit} />
              </td>
              <td className={tdNum}>
                {a.ageDays} d
                <div className="text-xs whitespace-normal text-ink-muted">
                  since {formatDay(a.firstAt, zones[a.siteId])}
                </div>
              </td>
              <ActionCell
                label={`Create finding for alert on ${a.pointTag}, ${a.bandName}`}
                onClick={
                  onCreateFinding &&
                  (() =>
                    onCreateFinding({
                      pointId: a.pointId,
                      pointTag: a.pointTag,
                      alertId: a.alertId,
                      bandKey: a.bandKey,
                      title: `${a.machineName}: ${a.level} on ${a.bandName} at ${a.pointTag}`,
                      context: `${a.pointTag} · ${a.bandName}: ${a.level}, ${formatNumber(a.lastValue)} against ${formatNumber(a.limitValue)} ${unitText(a.unit)}, open ${a.ageDays} days`,
                    }))
                }
              />
            </tr>
          ))}
        </Table>
      )}
    </ReviewSection>
  );
}

export function QualityNoticesTable({
  rows,
  total,
  onCreateFinding,
  zones,
  onMarkReviewed,
}: {
  rows: ReviewQualityNotice[];
  total: number;
  onCreateFinding: OnCreateFinding;
  /** Each site's time zone, by site id: dates are the site's days. */
  zones: Record<number, string>;
  /** Marks the point's notices reviewed; absent for readers who may not. */
  onMarkReviewed?: ((pointId: number, pointTag: string) => void) | undefined;
}) {
  return (
    <ReviewSection
      id="quality-notices"
      title="Quality notices of the week"
      count={total}
      description="Not yet reviewed: captures judged unusable (their values were not used), and the first capture of each run of suspect ones (their values were used, and alerts they raised are marked suspect)."
    >
      {rows.length === 0 ? (
        <Empty>No unreviewed quality notices this week.</Empty>
      ) : (
        <Table
          head={
            <>
              <th className={th}>Point</th>
              <th className={th}>Taken</th>
              <th className={th}>Verdict</th>
              <th className={th}>Findings</th>
              {actionHead(Boolean(onCreateFinding || onMarkReviewed))}
            </>
          }
        >
          {rows.map((n) => (
            <tr key={n.noticeId}>
              <PointCell row={n} />
              <td className={`${td} font-mono whitespace-nowrap`}>
                {formatDateTime(n.takenAt, zones[n.siteId])}
              </td>
              <td className={`${td} whitespace-nowrap`}>
                <StatusMark status="quality" labelHidden />{' '}
                <span>{n.verdict === 'unusable' ? 'Unusable' : 'Suspect'}</span>
              </td>
              <td className={td}>
                <ul className="flex flex-col gap-0.5">
                  {n.findings.map((f, i) => (
                    <li key={i}>
                      <span className="font-mono text-xs text-ink-muted">{f.code}</span> {f.message}
                    </li>
                  ))}
                </ul>
              </td>
              {onMarkReviewed && (
                <td data-print="hide" className={`${td} text-right`}>
                  <Button
                    size="sm"
                    variant="ghost"
                    onClick={() => onMarkReviewed(n.pointId, n.pointTag)}
                    aria-label={`Mark reviewed: notices of ${n.pointTag}`}
                  >
                    Mark reviewed
                  </Button>
                </td>
              )}
              <ActionCell
                label={`Create finding for quality notice on ${n.pointTag}`}
                onClick={
                  onCreateFinding &&
                  (() =>
                    onCreateFinding({
                      pointId: n.pointId,
                      pointTag: n.pointTag,
                      title: `${n.machineName}: check sensor at ${n.pointTag} (${n.findings[0]?.code ?? n.verdict})`,
                      context: `${n.pointTag} · capture of ${formatDay(n.takenAt, zones[n.siteId])} ${n.verdict}: ${n.findings.map((f) => f.message).join('; ')}`,
                    }))
                }
              />
            </tr>
          ))}
        </Table>
      )}
    </ReviewSection>
  );
}
