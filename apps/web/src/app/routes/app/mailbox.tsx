import { PageHeader } from '../../../components/ui/page-header.tsx';
import { MailboxView } from '../../../features/mailbox/components/mailbox-view.tsx';

export function MailboxRoute() {
  return (
    <div className="flex min-h-0 flex-1 flex-col gap-4 p-4 sm:px-6 sm:py-5">
      <title>Mailbox · Turnstone</title>
      <PageHeader
        title="Mailbox"
        description="What the local mail fake received. With a real mail relay configured, messages go out and this stays empty."
      />
      <MailboxView />
    </div>
  );
}
