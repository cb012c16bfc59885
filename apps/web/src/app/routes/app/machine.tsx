import { Link, useParams } from 'react-router-dom';
import { Card } from '../../../components/ui/card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { PageHeader } from '../../../components/ui/page-header.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { StatusMark } from '../../../components/ui/status-mark.tsx';
import { paths } from '../../../config/paths.ts';
import { useNow } from '../../../hooks/use-now.ts';
import { useMachine } from '../../../features/machines/api/get-machine.ts';
import { MachineData } from '../../../features/machines/components/machine-data.tsx';
import { MachinePointsTable } from '../../../features/machines/components/machine-points-table.tsx';
import { MachineHints } from '../../../features/machines/components/machine-hints.tsx';
import { MachineWhy } from '../../../features/machines/components/machine-why.tsx';
import { useMe } from '../../../features/auth/api/get-me.ts';

export function MachineRoute() {
  const { machineId } = useParams();
  const id = Number(machineId);
  const machine = useMachine(id);
  const me = useMe();
  const now = useNow();
  if (!Number.isInteger(id) || id <= 0)
    return (
      <EmptyState title="No such machine" description="The address does not name a machine." />
    );
  if (machine.isPending) return <LoadingPanel label="Loading machine…" />;
  if (machine.isError)
    return (
      <div className="p-6">
        <ErrorState
          title="Could not load the machine"
          error={machine.error}
          onRetry={() => void machine.refetch()}
          action={
            <Link className="text-sm text-accent underline" to={paths.app.fleet.getHref()}>
              Back to the fleet
            </Link>
          }
        />
      </div>
    );
  const m = machine.data;
  return (
    <div className="flex min-h-0 flex-1 flex-col gap-4 overflow-y-auto p-4 sm:px-6 sm:py-5">
      <title>{`${m.name} · Turnstone`}</title>
      <nav aria-label="Breadcrumb" className="text-xs text-ink-muted">
        <Link to={paths.app.fleet.getHref()} className="hover:underline">
          Fleet
        </Link>{' '}
        / {m.site.name} / {m.area.name}
      </nav>
      <PageHeader
        title={m.name}
        description={
          <span className="inline-flex flex-wrap items-center gap-3">
            <StatusMark status={m.status} />
            <span className="font-mono">{m.nominalRpm.toFixed(0)} r/min nominal</span>
            <span>{m.points.length} measurement points</span>
          </span>
        }
      />
      <MachineWhy machine={m} now={now} engineer={me.data?.role === 'engineer'} />
      <Card>
        <h2 className="px-4 pt-3 text-sm font-semibold text-ink">Points</h2>
        {m.points.length === 0 ? (
          <EmptyState
            title="No measurement points"
            description="An engineer adds points to this machine in Admin."
          />
        ) : (
          <MachinePointsTable machine={m} now={now} />
        )}
      </Card>
      {m.points.length > 0 && <MachineHints machine={m} />}
      <MachineData machine={m} />
    </div>
  );
}
