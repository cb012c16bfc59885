import { Page } from '../../../components/ui/page-header.tsx';
import { useMe } from '../../../features/auth/api/get-me.ts';
import { ChangePasswordForm } from '../../../features/account/components/change-password-form.tsx';
import { NotificationSettings } from '../../../features/account/components/notification-settings.tsx';
import { UnitSettings } from '../../../features/account/components/unit-settings.tsx';

export function AccountRoute() {
  const me = useMe();
  return (
    <Page title="Account" description={me.data ? `${me.data.name} · ${me.data.email}` : undefined}>
      <div className="grid items-start gap-4 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <NotificationSettings showDigest={me.data?.role === 'planner'} />
        <div className="flex flex-col gap-4">
          <UnitSettings />
          <ChangePasswordForm />
        </div>
      </div>
    </Page>
  );
}
