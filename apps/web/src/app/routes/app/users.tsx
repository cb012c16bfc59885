import { PageHeader } from '../../../components/ui/page-header.tsx';
import { useMe } from '../../../features/auth/api/get-me.ts';
import { UsersAdmin } from '../../../features/users/components/users-admin.tsx';

export function UsersRoute() {
  const me = useMe();
  return (
    <div className="flex flex-col gap-4 p-4 sm:px-6 sm:py-5">
      <title>Users · Turnstone</title>
      <PageHeader
        title="Users"
        description="Invite people, set their role and sites, and disable accounts. Disabling ends every session at once."
      />
      {me.data && <UsersAdmin meId={me.data.id} />}
    </div>
  );
}
