import { PageHeader } from '../../../components/ui/page-header.tsx';
import { MailboxView } from '../../../features/mailbox/components/mailbox-view.tsx';
import { UndeliveredMailPanel } from '../../../features/mailbox/components/undelivered-mail.tsx';

export function MailboxRoute() {
  return (
    <div className="flex min-h-0 flex-1 flex-col gap-4 p-4 sm:px-6 sm:py-5">
      <title>Mailbox · Turnstone</title>
      <PageHeader
        title="Mailbox"
        description="Outgoing mail that was not delivered, and what the local mail fake received. With a real mail relay configured, messages go out and the received list stays empty."
      />
      <UndeliveredMailPanel />
      <MailboxView />
    </div>
  );
}
