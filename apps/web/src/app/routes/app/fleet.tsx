import { PageHeader } from '../../../components/ui/page-header.tsx';
import { FleetExplorer } from '../../../features/fleet/components/fleet-explorer.tsx';

export function FleetRoute() {
  return (
    <div className="flex min-h-0 flex-1 flex-col gap-4 p-4 sm:px-6 sm:py-5">
      <title>Fleet · Turnstone</title>
      <PageHeader
        title="Fleet"
        description="Every machine you can see, with its worst current status and the age of its last snapshot."
      />
      <FleetExplorer />
    </div>
  );
}
