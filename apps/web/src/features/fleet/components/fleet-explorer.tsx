import type { NodeStatus } from '@turnstone/contracts/fleet';
import { useDeferredValue, useMemo, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { formatInteger } from '../../../lib/format.ts';
import { isNodeStatus, statusLabels } from '../../../lib/node-status.ts';
import { useFleet } from '../api/get-fleet.ts';
import { allMachineKeys, buildFleetRows, summariseFleet } from '../utils/build-fleet-rows.ts';
import { FleetStatusCounts } from './fleet-status-counts.tsx';
import { FleetToolbar } from './fleet-toolbar.tsx';
import { FleetTree } from './fleet-tree.tsx';

const noKeys: ReadonlySet<string> = new Set();

/**
 * The Fleet screen's body: status counts, search and status filter (kept in the URL as
 * `?q=` and `?status=` so a view can be shared), and the tree.
 */
export function FleetExplorer() {
  const fleet = useFleet();
  const [searchParams, setSearchParams] = useSearchParams();
  const query = searchParams.get('q') ?? '';
  const asked = searchParams.get('status');
  const status: NodeStatus | null = isNodeStatus(asked) ? asked : null;
  // The input keeps its own state so typing never waits for the router; the URL follows.
  const [input, setInput] = useState(query);
  const deferredQuery = useDeferredValue(input);

  // Collapsed nodes belong to one filter; a new search or status starts fully expanded.
  const filterKey = `${deferredQuery}\u0000${status ?? ''}`;
  const [collapsedState, setCollapsedState] = useState({ filterKey, keys: noKeys });
  const collapsed = collapsedState.filterKey === filterKey ? collapsedState.keys : noKeys;

  const data = fleet.data;
  const summary = useMemo(() => (data ? summariseFleet(data) : null), [data]);
  const { rows, machineMatches } = useMemo(
    () =>
      data
        ? buildFleetRows(data, { query: deferredQuery, status }, collapsed)
        : { rows: [], machineMatches: 0 },
    [data, deferredQuery, status, collapsed],
  );

  function updateParams(next: { q?: string; status?: NodeStatus | null }) {
    setSearchParams(
      (prev) => {
        const params = new URLSearchParams(prev);
        if (next.q !== undefined) {
          if (next.q) params.set('q', next.q);
          else params.delete('q');
        }
        if (next.status !== undefined) {
          if (next.status) params.set('status', next.status);
          else params.delete('status');
        }
        return params;
      },
      { replace: true },
    );
  }

  function toggle(key: string) {
    const keys = new Set(collapsed);
    if (keys.has(key)) keys.delete(key);
    else keys.add(key);
    setCollapsedState({ filterKey, keys });
  }

  if (fleet.isPending) return <LoadingPanel label="Loading the fleet…" />;
  if (fleet.isError) {
    return (
      <Card>
        <ErrorState
          title="Could not load the fleet"
          error={fleet.error}
          onRetry={() => void fleet.refetch()}
          retrying={fleet.isFetching}
        />
      </Card>
    );
  }
  if (!summary || summary.machineTotal === 0) {
    return (
      <Card>
        <EmptyState
          title="No machines to show yet"
          description="Either no machines have been set up, or your account has no sites assigned. An administrator can add sites, machines and your access."
        />
      </Card>
    );
  }

  const tree = fleet.data;
  const filtering = Boolean(input.trim() || status);
  const resultText = filtering
    ? `${formatInteger(machineMatches)} of ${formatInteger(summary.machineTotal)} machines match`
    : `${formatInteger(summary.machineTotal)} machines · ${formatInteger(summary.pointTotal)} points`;

  return (
    <div className="flex min-h-0 flex-1 flex-col gap-4">
      <FleetStatusCounts
        summary={summary}
        selected={status}
        onSelect={(s) => updateParams({ status: s })}
      />
      <Card className="flex min-h-0 flex-1 flex-col overflow-hidden">
        <div className="border-b border-line px-3 py-3">
          <FleetToolbar
            query={input}
            onQueryChange={(q) => {
              setInput(q);
              updateParams({ q });
            }}
            status={status}
            onStatusChange={(s) => updateParams({ status: s })}
            onExpandAll={() => setCollapsedState({ filterKey, keys: noKeys })}
            onCollapseMachines={() =>
              setCollapsedState({ filterKey, keys: new Set(allMachineKeys(tree)) })
            }
            resultText={resultText}
          />
        </div>
        {rows.length === 0 ? (
          <EmptyState
            title="No machines match"
            description={
              <>
                Nothing matches
                {input.trim() && (
                  <>
                    {' '}
                    “<span className="font-mono text-ink">{input.trim()}</span>”
                  </>
                )}
                {status && <> with status {statusLabels[status]}</>}.
              </>
            }
            action={
              <Button
                onClick={() => {
                  setInput('');
                  updateParams({ q: '', status: null });
                }}
              >
                Clear filters
              </Button>
            }
          />
        ) : (
          <FleetTree
            rows={rows}
            onToggle={toggle}
            label="Fleet: sites, areas, machines and points"
          />
        )}
      </Card>
    </div>
  );
}
