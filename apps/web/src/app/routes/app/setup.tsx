import { PageHeader } from '../../../components/ui/page-header.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { useMe } from '../../../features/auth/api/get-me.ts';
import { SetupExplorer } from '../../../features/setup/components/setup-explorer.tsx';

export function SetupRoute() {
  const me = useMe();
  return (
    <div className="flex min-h-0 flex-1 flex-col gap-4 p-4 sm:px-6 sm:py-5">
      <title>Plant setup · Turnstone</title>
      <PageHeader
        title="Plant setup"
        description={
          me.data?.role === 'admin'
            ? 'Sites, areas, machines with their bearings and gears, and measurement points.'
            : 'Machines with their bearings and gears, and measurement points, at your sites.'
        }
      />
      {me.data ? <SetupExplorer role={me.data.role} /> : <LoadingPanel />}
    </div>
  );
}
