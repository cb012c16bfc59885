import type { AuditEntry } from '@turnstone/contracts/audit';
import { useMemo, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { Field, Input, InputField, SelectField } from '../../../components/ui/field.tsx';
import { TableHead } from '../../../components/ui/table-head.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { addDays, dayStart } from '@turnstone/contracts/dates';
import { displayTimeZone, formatDateTime } from '../../../lib/format.ts';
import { useAudit, type AuditFilters } from '../api/get-audit.ts';

const ENTITIES = [
  ['', 'Anything'],
  ['site', 'Site'],
  ['area', 'Area'],
  ['machine', 'Machine'],
  ['point', 'Point'],
  ['gateway', 'Gateway'],
  ['limit_set', 'Limit set'],
  ['alert', 'Alert'],
  ['finding', 'Finding'],
  ['user', 'User'],
] as const;

/**
 * A date (yyyy-mm-dd) as the ISO instant of its start, or of the next day's start, in the
 * screen's zone (the one its times are shown in).
 */
function dayBoundary(date: string, end: boolean): string | undefined {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(date)) return undefined;
  return new Date(dayStart(end ? addDays(date, 1) : date, displayTimeZone())).toISOString();
}

function compact(value: unknown): string {
  if (value === null || value === undefined) return '—';
  const text = JSON.stringify(value);
  return text.length > 160 ? `${text.slice(0, 160)}…` : text;
}

/** The change as plain lines (field: old → new), with the full record behind a disclosure. */
function ChangeCell({ entry }: { entry: AuditEntry }) {
  const hasBefore = entry.before !== null && entry.before !== undefined;
  const hasAfter = entry.after !== null && entry.after !== undefined;
  if (!hasBefore && !hasAfter) return <span className="text-ink-faint">—</span>;
  return (
    <div className="flex max-w-[36rem] flex-col gap-1">
      {entry.changes.length > 0 && (
        <ul className="flex flex-col gap-0.5 text-[13px]" aria-label="Changes">
          {entry.changes.map((c, i) => (
            <li key={i}>
              <span className="text-ink-muted">{c.field}: </span>
              <span className="font-mono">
                {c.before ?? '—'} → {c.after ?? '—'}
              </span>
            </li>
          ))}
        </ul>
      )}
      <details className="group">
        <summary className="cursor-pointer text-xs text-ink-muted group-open:text-ink">
          {entry.changes.length > 0 ? 'Full record' : compact(entry.after ?? entry.before)}
        </summary>
        <div className="mt-2 grid gap-2 sm:grid-cols-2">
          <div>
            <p className="text-xs font-medium text-ink-muted">Before</p>
            <pre className="mt-1 max-h-64 overflow-auto rounded bg-sunken p-2 font-mono text-[11px]">
              {JSON.stringify(entry.before, null, 2) ?? '—'}
            </pre>
          </div>
          <div>
            <p className="text-xs font-medium text-ink-muted">After</p>
            <pre className="mt-1 max-h-64 overflow-auto rounded bg-sunken p-2 font-mono text-[11px]">
              {JSON.stringify(entry.after, null, 2) ?? '—'}
            </pre>
          </div>
        </div>
      </details>
    </div>
  );
}

/** A filter control's value and its change handler, kept in a string state. */
function bind(value: string, set: (v: string) => void) {
  return {
    value,
    onChange: (e: { target: { value: string } }) => set(e.target.value),
  };
}

export function AuditLog() {
  // Other screens link here with ?entity=&entityId= (paths.app.audit.getHref).
  const [searchParams] = useSearchParams();
  const [entity, setEntity] = useState(searchParams.get('entity') ?? '');
  const [entityId, setEntityId] = useState(searchParams.get('entityId') ?? '');
  const [action, setAction] = useState('');
  const [actor, setActor] = useState('');
  const [fromDate, setFromDate] = useState('');
  const [toDate, setToDate] = useState('');
  const [actors, setActors] = useState<Map<number, string>>(new Map());

  const filters: AuditFilters = useMemo(
    () => ({
      entity: entity || undefined,
      entityId: entityId.trim() || undefined,
      action: action.trim() || undefined,
      actor: actor ? Number(actor) : undefined,
      from: dayBoundary(fromDate, false),
      to: dayBoundary(toDate, true),
    }),
    [entity, entityId, action, actor, fromDate, toDate],
  );
  const audit = useAudit(filters);
  const items = useMemo(() => audit.data?.pages.flatMap((p) => p.items) ?? [], [audit.data]);

  // Remember every actor seen, so choosing one does not empty the list of choices
  // (state adjusted while rendering, as React's docs suggest for derived state).
  const [mergedFrom, setMergedFrom] = useState<AuditEntry[] | null>(null);
  if (mergedFrom !== items) {
    setMergedFrom(items);
    const missing = items.filter((e) => e.actorUserId !== null && !actors.has(e.actorUserId));
    if (missing.length > 0) {
      const next = new Map(actors);
      for (const e of missing) next.set(e.actorUserId!, e.actorName ?? `User ${e.actorUserId}`);
      setActors(next);
    }
  }

  const clear = () => {
    setEntity('');
    setEntityId('');
    setAction('');
    setActor('');
    setFromDate('');
    setToDate('');
  };

  return (
    <div className="flex flex-col gap-4">
      <Card className="p-4">
        <form
          role="search"
          aria-label="Filter the audit log"
          className="grid grid-cols-2 items-end gap-3 md:grid-cols-4 xl:grid-cols-7"
          onSubmit={(e) => e.preventDefault()}
        >
          <SelectField label="Entity" options={ENTITIES} {...bind(entity, setEntity)} />
          <InputField
            label="Entity id"
            controlSize="sm"
            inputClassName="font-mono"
            {...bind(entityId, setEntityId)}
          />
          <Field label="Action">
            {(ids) => (
              <Input
                id={ids.id}
                aria-describedby="audit-action-hint"
                controlSize="sm"
                className="font-mono"
                placeholder="gateway."
                {...bind(action, setAction)}
              />
            )}
          </Field>
          <SelectField
            label="Who"
            options={[['', 'Anyone'], ...actors]}
            {...bind(actor, setActor)}
          />
          <InputField label="From" type="date" controlSize="sm" {...bind(fromDate, setFromDate)} />
          <InputField label="To" type="date" controlSize="sm" {...bind(toDate, setToDate)} />
          <Button size="sm" variant="ghost" className="h-9" onClick={clear}>
            Clear filters
          </Button>
        </form>
        <p id="audit-action-hint" className="mt-2 text-xs text-ink-muted">
          Action: an exact name such as <span className="font-mono">point.update</span>, or a prefix
          ending in a dot such as <span className="font-mono">gateway.</span>
        </p>
      </Card>

      <Card className="overflow-x-auto">
        {audit.isPending ? (
          <LoadingPanel />
        ) : audit.isError ? (
          <ErrorState
            error={audit.error}
            onRetry={() => void audit.refetch()}
            retrying={audit.isFetching}
          />
        ) : items.length === 0 ? (
          <EmptyState
            title="No entries"
            description="Nothing in the audit log matches these filters."
          />
        ) : (
          <table className="w-full text-sm">
            <caption className="sr-only">Audit log, newest first</caption>
            <TableHead look="ruled" columns={['When', 'Who', 'Action', 'On', 'Change', 'Reason']} />
            <tbody>
              {items.map((e) => (
                <tr key={e.id} className="border-b border-line align-top last:border-0">
                  <td className="px-4 py-2.5 whitespace-nowrap">
                    <time dateTime={e.at}>{formatDateTime(e.at)}</time>
                  </td>
                  <td className="px-4 py-2.5 whitespace-nowrap">
                    {e.actorName ?? <span className="text-ink-faint">system</span>}
                  </td>
                  <td className="px-4 py-2.5 font-mono text-[13px] whitespace-nowrap">
                    {e.action}
                  </td>
                  <td className="px-4 py-2.5">
                    <span className="block text-xs text-ink-muted">{e.entity}</span>
                    {e.entityLabel ? (
                      <span className="font-mono text-[13px]">{e.entityLabel}</span>
                    ) : (
                      <span className="font-mono text-xs text-ink-muted">#{e.entityId}</span>
                    )}
                  </td>
                  <td className="px-4 py-2.5">
                    <ChangeCell entry={e} />
                  </td>
                  <td className="px-4 py-2.5 text-ink-muted">{e.reason ?? '—'}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        {audit.hasNextPage && (
          <div className="border-t border-line p-3 text-center">
            <Button
              size="sm"
              busy={audit.isFetchingNextPage}
              onClick={() => void audit.fetchNextPage()}
            >
              Show older entries
            </Button>
          </div>
        )}
      </Card>
    </div>
  );
}
