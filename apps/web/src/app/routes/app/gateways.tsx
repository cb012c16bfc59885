import { PageHeader } from '../../../components/ui/page-header.tsx';
import { GatewaysPanel } from '../../../features/gateways/components/gateways-panel.tsx';
import { RetentionCard } from '../../../features/retention/components/retention-card.tsx';

export function GatewaysRoute() {
  return (
    <div className="flex min-h-0 flex-1 flex-col gap-4 p-4 sm:px-6 sm:py-5">
      <title>Gateways · Turnstone</title>
      <PageHeader
        title="Gateways"
        description="Field gateways that post snapshots, one API key each. A key is shown once, when it is made."
      />
      <GatewaysPanel />
      <RetentionCard />
    </div>
  );
}
