import { Navigate } from 'react-router-dom';
import { PageHeader } from '../../../components/ui/page-header.tsx';
import { paths } from '../../../config/paths.ts';
import { useMe } from '../../../features/auth/api/get-me.ts';
import { LimitsWorkspace } from '../../../features/limits/components/limits-workspace.tsx';

export function LimitsRoute() {
  const me = useMe();
  if (me.data && me.data.role !== 'engineer')
    return <Navigate to={paths.app.fleet.getHref()} replace />;
  return (
    <div className="flex min-h-0 flex-1 flex-col gap-4 overflow-auto p-4 sm:px-6 sm:py-5">
      <title>Limits · Turnstone</title>
      <PageHeader
        title="Limits"
        description="Alarm bands of a point: where in the spectrum, which levels, how many exceedances raise and when they clear."
      />
      <p
        role="note"
        className="max-w-4xl rounded-md border border-line-strong bg-surface px-3 py-2 text-sm text-ink"
      >
        <strong className="font-semibold">Safety:</strong> Turnstone is not a machine-protection
        system; alarm limits must be set and reviewed by competent people against the manufacturer’s
        data and site standards, and inspection follows site isolation and lock-out procedures.
      </p>
      <LimitsWorkspace />
    </div>
  );
}
