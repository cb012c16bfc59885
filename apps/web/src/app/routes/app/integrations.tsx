import { PageHeader } from '../../../components/ui/page-header.tsx';
import { ApiTokensPanel } from '../../../features/integrations/components/api-tokens-panel.tsx';
import { WebhooksPanel } from '../../../features/integrations/components/webhooks-panel.tsx';

export function IntegrationsRoute() {
  return (
    <div className="flex flex-col gap-6 p-4 sm:px-6 sm:py-5">
      <title>Integrations · Turnstone</title>
      <PageHeader
        title="Integrations"
        description="API tokens for systems that read and write through the API, and webhooks that tell them of alert and finding changes as they happen."
      />
      <ApiTokensPanel />
      <WebhooksPanel />
    </div>
  );
}
