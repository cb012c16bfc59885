import type {
  ReviewAlert,
  ReviewForecast,
  ReviewMover,
  ReviewQualityNotice,
} from '@turnstone/contracts/review';

import { StatusMark } from '../../../components/ui/status-mark.tsx';

import { formatNumber } from '@turnstone/contracts/number-format';
import { unitText } from '@turnstone/contracts/units';
import { formatDay, formatPercent, formatSigned } from '../utils/format-review.ts';

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

export function MoversTable({
  rows,
  total,
  onCreateFinding,
}: {
  rows: ReviewMover[];
  total: number;
  onCreateFinding: OnCreateFinding;
}) {
  return (
    <ReviewSection
      id="movers"
      title="Largest increases"
      count={total}
      description="Mean of this week’s values against last week’s, per point and band; largest rise first."
    >
      {rows.length === 0 ? (
        <Empty>No band rose against last week (or no point has values in both weeks).</Empty>
      ) : (
        <Table
          head={
            <>
              <th className={th}>Point</th>
              <th className={th}>Band</th>
              <th className={thNum}>Last week</th>
              <th className={thNum}>This week</th>
              <th className={thNum}>Change</th>
              <th className={thNum}>Change %</th>
              {actionHead(Boolean(onCreateFinding))}
            </>
          }
        >
          {rows.map((m) => (
            <tr key={`${m.pointId}-${m.bandKey}`}>
              <PointCell row={m} />
              <td className={td}>{m.bandName}</td>
              <td className={tdNum}>
                <Value value={m.lastWeekMean} unit={m.unit} />
              </td>
              <td className={tdNum}>
                <Value value={m.thisWeekMean} unit={m.unit} />
              </td>
              <td className={tdNum}>
                {formatSigned(m.change)} <span className="text-ink-muted">{unitText(m.unit)}</span>
              </td>
              <td className={`${tdNum} font-semibold`}>
                <span aria-hidden="true" className="mr-1 text-status-alert">
                  ▲
                </span>
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
                      context: `${m.pointTag} · ${m.bandName}: ${formatNumber(m.lastWeekMean)} → ${formatNumber(m.thisWeekMean)} ${unitText(m.unit)} (${formatPercent(m.changePercent)})`,
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

export function ForecastsTable({
  rows,
  total,
  weeksAhead,
  onCreateFinding,
}: {
  rows: ReviewForecast[];
  total: number;
  weeksAhead: number;
  onCreateFinding: OnCreateFinding;
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
                <span className="font-mono">{formatDay(f.crossingAt)}</span>
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
                      title: `${f.machineName}: ${f.bandName} projected to reach ${f.target.level} by ${formatDay(f.crossingAt)}`,
                      context: `${f.pointTag} · ${f.bandName}: ${formatNumber(f.latestValue)} ${unitText(f.unit)} now, ${f.target.level} level ${formatNumber(f.target.value)} ${unitText(f.unit)} projected ${formatDay(f.crossingAt)} (${f.model}, R² ${f.r2.toFixed(2)})`,
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
}: {
  rows: ReviewAlert[];
  total: number;
  onCreateFinding: OnCreateFinding;
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
                  since {formatDay(a.firstAt)}
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
}: {
  rows: ReviewQualityNotice[];
  total: number;
  onCreateFinding: OnCreateFinding;
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
              {actionHead(Boolean(onCreateFinding))}
            </>
          }
        >
          {rows.map((n) => (
            <tr key={n.noticeId}>
              <PointCell row={n} />
              <td className={`${td} font-mono whitespace-nowrap`}>{formatDay(n.takenAt)}</td>
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
              <ActionCell
                label={`Create finding for quality notice on ${n.pointTag}`}
                onClick={
                  onCreateFinding &&
                  (() =>
                    onCreateFinding({
                      pointId: n.pointId,
                      pointTag: n.pointTag,
                      title: `${n.machineName}: check sensor at ${n.pointTag} (${n.findings[0]?.code ?? n.verdict})`,
                      context: `${n.pointTag} · capture of ${formatDay(n.takenAt)} ${n.verdict}: ${n.findings.map((f) => f.message).join('; ')}`,
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
