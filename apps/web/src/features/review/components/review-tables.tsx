import type {
  ReviewAlert,
  ReviewForecast,
  ReviewMover,
  ReviewQualityNotice,
} from '@turnstone/contracts/review';
import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { StatusMark } from '../../../components/ui/status-mark.tsx';
import { paths } from '../../../config/paths.ts';
import {
  formatDay,
  formatPercent,
  formatSigned,
  formatValue,
  unitLabel,
} from '../utils/format-review.ts';

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

function Empty({ children }: { children: ReactNode }) {
  return <p className="px-4 py-6 text-center text-sm text-ink-muted">{children}</p>;
}

const th = 'px-3 py-2 text-left text-xs font-medium text-ink-muted whitespace-nowrap';
const thNum = `${th} text-right`;
const td = 'px-3 py-2 align-top text-[13px] text-ink';
const tdNum = `${td} text-right font-mono whitespace-nowrap`;

function Table({ head, children }: { head: ReactNode; children: ReactNode }) {
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
function PointCell({
  row,
}: {
  row: { pointId: number; pointTag: string; pointName: string; machineName: string };
}) {
  return (
    <td className={td}>
      <Link
        to={paths.app.point.getHref(row.pointId)}
        className="font-mono text-[13px] font-medium whitespace-nowrap text-accent underline-offset-2 hover:underline"
      >
        {row.pointTag}
      </Link>
      <div className="text-xs text-ink-muted">
        {row.machineName} · {row.pointName}
      </div>
    </td>
  );
}

function Value({ value, unit }: { value: number; unit: string }) {
  return (
    <>
      {formatValue(value)} <span className="text-ink-muted">{unitLabel(unit)}</span>
    </>
  );
}

function ActionCell({ label, onClick }: { label: string; onClick: (() => void) | undefined }) {
  if (!onClick) return null;
  return (
    <td data-print="hide" className={`${td} text-right`}>
      <Button size="sm" onClick={onClick} aria-label={label}>
        Create finding
      </Button>
    </td>
  );
}

const actionHead = (show: boolean) =>
  show ? (
    <th data-print="hide" className={th}>
      <span className="sr-only">Actions</span>
    </th>
  ) : null;

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
                {formatSigned(m.change)} <span className="text-ink-muted">{unitLabel(m.unit)}</span>
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
                      context: `${m.pointTag} · ${m.bandName}: ${formatValue(m.lastWeekMean)} → ${formatValue(m.thisWeekMean)} ${unitLabel(m.unit)} (${formatPercent(m.changePercent)})`,
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
                  {formatValue(f.target.value)} {unitLabel(f.unit)}
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
                      context: `${f.pointTag} · ${f.bandName}: ${formatValue(f.latestValue)} ${unitLabel(f.unit)} now, ${f.target.level} level ${formatValue(f.target.value)} ${unitLabel(f.unit)} projected ${formatDay(f.crossingAt)} (${f.model}, R² ${f.r2.toFixed(2)})`,
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
                {formatValue(a.lastValue)} / <Value value={a.limitValue} unit={a.unit} />
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
                      context: `${a.pointTag} · ${a.bandName}: ${a.level}, ${formatValue(a.lastValue)} against ${formatValue(a.limitValue)} ${unitLabel(a.unit)}, open ${a.ageDays} days`,
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
