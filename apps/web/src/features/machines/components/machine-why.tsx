import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { Alert } from '@turnstone/contracts/alerts';
import type { Finding } from '@turnstone/contracts/findings';
import { findingPriorityLabels, findingStateLabels } from '@turnstone/contracts/findings';
import type { MachineDetail } from '@turnstone/contracts/points';
import { Card } from '../../../components/ui/card.tsx';
import { TextLink } from '../../../components/ui/text-link.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { StatusMark } from '../../../components/ui/status-mark.tsx';
import { paths } from '../../../config/paths.ts';
import { formatAge, formatDateTime } from '../../../lib/format.ts';
import { useUnits } from '../../account/api/use-units.ts';
import { useMachineAttention } from '../api/get-machine-attention.ts';

const stateText = { raised: 'raised', acknowledged: 'acknowledged', cleared: 'cleared' } as const;

/**
 * Why the machine is in the state it is: its open alerts (danger first) and the findings not
 * yet done, each linked to its point opened on its band; links to Limits and Setup for the
 * engineer.
 */
export function MachineWhy({
  machine,
  now,
  engineer,
}: {
  machine: MachineDetail;
  now: number;
  engineer: boolean;
}) {
  const q = useMachineAttention(machine.id);
  return (
    <Card className="flex flex-col gap-3 p-4" aria-labelledby="machine-why">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="machine-why" className="text-sm font-semibold text-ink">
          Why this state
        </h2>
        {engineer && (
          <div className="flex gap-3 text-sm">
            <TextLink
              to={paths.app.limits.getHref(q.data?.alerts[0]?.pointId ?? machine.points[0]?.id)}
            >
              Limits
            </TextLink>
            <TextLink to={paths.app.setup.getHref()}>Setup</TextLink>
          </div>
        )}
      </div>
      {q.isPending ? (
        <LoadingPanel label="Loading alerts and findings…" />
      ) : q.isError ? (
        <ErrorState
          title="Could not load the machine's alerts"
          error={q.error}
          onRetry={() => void q.refetch()}
        />
      ) : q.data.alerts.length === 0 && q.data.findings.length === 0 ? (
        <p className="text-sm text-ink-muted">
          No open alerts and no open findings on this machine
          {machine.status === 'quality' || machine.status === 'stale'
            ? ` — its state comes from capture quality or missing captures (see the points below).`
            : '.'}
        </p>
      ) : (
        <div className="grid gap-4 lg:grid-cols-2">
          <WhyList id="why-alerts" title="Open alerts" count={q.data.alerts.length}>
            {q.data.alerts.map((a) => (
              <AlertLine key={a.id} alert={a} now={now} />
            ))}
          </WhyList>
          <WhyList id="why-findings" title="Open findings" count={q.data.findings.length}>
            {q.data.findings.map((f) => (
              <FindingLine
                key={f.id}
                finding={f}
                bandName={
                  q.data.alerts.find((a) => a.pointId === f.pointId && a.bandKey === f.bandKey)
                    ?.bandName ?? f.bandKey
                }
              />
            ))}
          </WhyList>
        </div>
      )}
    </Card>
  );
}

/** One of the two lists (alerts, findings): its heading with the count, and its lines. */
function WhyList({
  id,
  title,
  count,
  children,
}: {
  id: string;
  title: string;
  count: number;
  children: ReactNode;
}) {
  return (
    <section aria-labelledby={id} className="flex flex-col gap-2">
      <h3 id={id} className="text-xs font-medium text-ink-muted">
        {title} ({count})
      </h3>
      {count === 0 ? (
        <p className="text-sm text-ink-muted">None.</p>
      ) : (
        <ul className="flex flex-col divide-y divide-line">{children}</ul>
      )}
    </section>
  );
}

function AlertLine({ alert: a, now }: { alert: Alert; now: number }) {
  const units = useUnits();
  return (
    <li className="flex flex-col gap-0.5 py-2 text-sm">
      <div className="flex flex-wrap items-center gap-x-2 gap-y-1">
        <StatusMark status={a.level} />
        <TextLink to={paths.app.point.getHref(a.pointId, a.bandKey)} className="font-medium">
          {a.pointName} · {a.bandName}
        </TextLink>
        <span className="font-mono text-xs text-ink-muted">{a.pointTag}</span>
      </div>
      <div className="font-mono text-[13px] text-ink">
        {units.format(a.value, a.unit)} <span className="font-sans text-ink-muted">over</span>{' '}
        {units.format(a.limit, a.unit)}
        {a.suspect ? <span className="font-sans text-ink-muted"> · suspect capture</span> : null}
      </div>
      <div className="text-xs text-ink-muted">
        {stateText[a.state]} {formatAge(a.firstAt, now)}
        {a.acknowledgedBy ? ` · acknowledged by ${a.acknowledgedBy}` : ''}
        {a.acknowledgeNote ? `: “${a.acknowledgeNote}”` : ''} ·{' '}
        <Link
          className="text-accent underline underline-offset-2"
          to={paths.app.alerts.getHref(a.id)}
        >
          alert detail
        </Link>
      </div>
    </li>
  );
}

function FindingLine({ finding: f, bandName }: { finding: Finding; bandName: string | null }) {
  return (
    <li className="flex flex-col gap-0.5 py-2 text-sm">
      <TextLink
        to={paths.app.point.getHref(f.pointId, f.bandKey ?? undefined)}
        className="font-medium"
      >
        {f.title}
      </TextLink>
      <div className="text-xs text-ink-muted">
        {f.pointName} <span className="font-mono">{f.pointTag}</span>
        {bandName ? ` · ${bandName}` : ''} · {findingStateLabels[f.state]} ·{' '}
        {findingPriorityLabels[f.priority]} priority
        {f.dueDate ? ` · due ${f.dueDate}` : ''}
        {f.workOrderRef ? ` · work order ${f.workOrderRef}` : ''}
      </div>
      <div className="text-xs text-ink-faint">
        by {f.createdBy.name}, {formatDateTime(f.createdAt)}
      </div>
    </li>
  );
}
