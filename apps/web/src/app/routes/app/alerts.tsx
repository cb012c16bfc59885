import { PageHeader } from '../../../components/ui/page-header.tsx';
import { useMe } from '../../../features/auth/api/get-me.ts';
import { AlertsExplorer } from '../../../features/alerts/components/alerts-explorer.tsx';

export function AlertsRoute() {
  const me = useMe();
  const role = me.data?.role;
  const canAcknowledge = role === 'operator' || role === 'engineer';
  return (
    <div className="flex min-h-0 flex-1 flex-col gap-4 p-4 sm:px-6 sm:py-5">
      <title>Alerts · Turnstone</title>
      <PageHeader
        title="Alerts"
        description={
          canAcknowledge
            ? 'Alerts on your sites. Select raised ones and acknowledge them with a note; open a row for its history.'
            : 'Alerts on your sites; open a row for its history.'
        }
      />
      <AlertsExplorer canAcknowledge={canAcknowledge} userName={me.data?.name ?? ''} />
    </div>
  );
}
