import { Page } from '../../../components/ui/page-header.tsx';
import { useMe } from '../../../features/auth/api/get-me.ts';
import { UsersAdmin } from '../../../features/users/components/users-admin.tsx';

export function UsersRoute() {
  const me = useMe();
  return (
    <Page
      title="Users"
      description="Invite people, set their role and sites, and disable accounts. Disabling ends every session at once."
    >
      {me.data && <UsersAdmin meId={me.data.id} />}
    </Page>
  );
}
