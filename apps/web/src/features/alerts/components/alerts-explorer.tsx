import { useCallback, useMemo, useRef, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import type { RowSelectionState } from '@tanstack/react-table';
import { Card } from '../../../components/ui/card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { FilterSelect, type SelectOption } from '../../../components/ui/field.tsx';
import { LoadingPanel, Spinner } from '../../../components/ui/spinner.tsx';
import { useNow } from '../../../hooks/use-now.ts';
import { alertFiltersFromSearch, useAlerts, useSites } from '../api/get-alerts.ts';
import { AcknowledgeForm } from './acknowledge-form.tsx';
import { AlertHistory } from './alert-history.tsx';
import { AlertsTable } from './alerts-table.tsx';

const stateOptions: SelectOption[] = [
  ['open', 'Open (raised or acknowledged)'],
  ['raised', 'Raised'],
  ['acknowledged', 'Acknowledged'],
  ['cleared', 'Cleared'],
  ['all', 'All'],
];
const levelOptions: SelectOption[] = [
  ['', 'Alert and danger'],
  ['danger', 'Danger'],
  ['alert', 'Alert'],
];

/** Filters, the alert table, the acknowledgement form and the selected alert's history. */
export function AlertsExplorer({
  canAcknowledge,
  userName,
}: {
  canAcknowledge: boolean;
  userName: string;
}) {
  const [params, setParams] = useSearchParams();
  const { stateFilter, filters } = alertFiltersFromSearch(params);
  const level = filters.level;
  const siteId = Number(params.get('site')) || undefined;
  const openId = Number(params.get('alert')) || null;
  const alerts = useAlerts(filters);
  const sites = useSites();
  const now = useNow(30_000);
  const [selection, setSelection] = useState<RowSelectionState>({});
  const [message, setMessage] = useState<string | null>(null);
  const messageRef = useRef<HTMLParagraphElement>(null);

  const setParam = (key: string, value: string | null) => {
    const next = new URLSearchParams(params);
    if (value === null || value === '') next.delete(key);
    else next.set(key, value);
    setParams(next, { replace: true });
    if (key !== 'alert') setSelection({});
  };
  const onOpen = useCallback(
    (id: number) => {
      const next = new URLSearchParams(params);
      next.set('alert', String(id));
      setParams(next, { replace: true });
    },
    [params, setParams],
  );

  // Closing the panel gives the focus back to the row's button that opened it.
  const closePanel = () => {
    const id = openId;
    setParam('alert', null);
    requestAnimationFrame(() =>
      document.querySelector<HTMLElement>(`[data-alert-open="${id}"]`)?.focus(),
    );
  };

  const rows = useMemo(() => {
    const items = alerts.data?.items ?? [];
    return stateFilter === 'open' ? items.filter((a) => a.state !== 'cleared') : items;
  }, [alerts.data, stateFilter]);
  const raisedIds = new Set(rows.filter((a) => a.state === 'raised').map((a) => a.id));
  const selectedIds = Object.keys(selection)
    .filter((k) => selection[k])
    .map(Number)
    .filter((id) => raisedIds.has(id));
  const counts = {
    danger: rows.filter((a) => a.level === 'danger' && a.state !== 'cleared').length,
    alert: rows.filter((a) => a.level === 'alert' && a.state !== 'cleared').length,
    raised: raisedIds.size,
  };

  return (
    <div className="flex min-h-0 flex-1 flex-col gap-4 lg:flex-row">
      <div className="flex min-w-0 flex-1 flex-col gap-3">
        <div className="flex flex-wrap items-end gap-3" role="group" aria-label="Filters">
          <FilterSelect
            label="State"
            options={stateOptions}
            value={stateFilter}
            onChange={(e) => setParam('state', e.target.value === 'open' ? null : e.target.value)}
          />
          <FilterSelect
            label="Level"
            options={levelOptions}
            value={level ?? ''}
            onChange={(e) => setParam('level', e.target.value || null)}
          />
          <FilterSelect
            label="Site"
            options={[
              ['', 'Every site'],
              ...(sites.data?.items ?? []).map((s): SelectOption => [s.id, s.name]),
            ]}
            value={siteId ?? ''}
            onChange={(e) => setParam('site', e.target.value || null)}
          />
          <p className="ml-auto flex items-center gap-2 text-xs text-ink-muted" aria-live="polite">
            {alerts.isFetching && !alerts.isPending && <Spinner size="sm" />}
            <span className="font-mono">{counts.danger}</span> danger ·{' '}
            <span className="font-mono">{counts.alert}</span> alert ·{' '}
            <span className="font-mono">{counts.raised}</span> waiting for acknowledgement · updates
            every 15 s
          </p>
        </div>

        {/* Always in the page, so screen readers announce what is written into it. */}
        <div role="status">
          {message && (
            <p
              ref={messageRef}
              tabIndex={-1}
              className="rounded-md border border-line bg-accent-soft px-3 py-2 text-sm text-ink focus-visible:outline-none"
            >
              {message}
            </p>
          )}
        </div>

        {canAcknowledge && rows.some((a) => a.state === 'raised') && (
          <Card className="px-4 py-3">
            <AcknowledgeForm
              ids={selectedIds}
              userName={userName}
              onDone={(m) => {
                setMessage(m);
                setSelection({});
                // The button goes with the selection: the focus moves to the outcome.
                requestAnimationFrame(() => messageRef.current?.focus());
              }}
            />
          </Card>
        )}

        <Card
          className="min-h-0 flex-1 overflow-auto transition-opacity"
          style={{ opacity: alerts.isPlaceholderData ? 0.6 : 1 }}
          aria-busy={alerts.isPlaceholderData || undefined}
        >
          {alerts.isPending ? (
            <LoadingPanel label="Loading alerts…" />
          ) : alerts.isError ? (
            <ErrorState
              title="Could not load the alerts"
              error={alerts.error}
              onRetry={() => void alerts.refetch()}
              retrying={alerts.isFetching}
            />
          ) : rows.length === 0 ? (
            <EmptyState
              title="No alerts match"
              description={
                stateFilter === 'open'
                  ? 'Nothing is raised or waiting on your sites. New alerts appear here within 15 seconds.'
                  : 'Change the filters to see more.'
              }
            />
          ) : (
            <AlertsTable
              alerts={rows}
              now={now}
              selectable={canAcknowledge}
              selection={selection}
              onSelectionChange={setSelection}
              openId={openId}
              onOpen={onOpen}
            />
          )}
        </Card>
      </div>
      {openId !== null && (
        <Card className="w-full shrink-0 overflow-auto lg:w-80">
          <AlertHistory
            id={openId}
            onClose={closePanel}
            acknowledge={
              canAcknowledge ? { userName, onDone: (m: string) => setMessage(m) } : undefined
            }
          />
        </Card>
      )}
    </div>
  );
}
