import { PageHeader } from '../../../components/ui/page-header.tsx';
import { useMe } from '../../../features/auth/api/get-me.ts';
import { AuditLog } from '../../../features/audit/components/audit-log.tsx';

export function AuditRoute() {
  const me = useMe();
  const scope =
    me.data && me.data.role !== 'admin'
      ? ' You see the changes on your sites and to the machine-type templates.'
      : '';
  return (
    <div className="flex min-h-0 flex-1 flex-col gap-4 p-4 sm:px-6 sm:py-5">
      <title>Audit log · Turnstone</title>
      <PageHeader
        title="Audit log"
        description={`Every change to the plant, limits, keys and alerts: who, when, before and after. Newest first.${scope}`}
      />
      <AuditLog />
    </div>
  );
}
