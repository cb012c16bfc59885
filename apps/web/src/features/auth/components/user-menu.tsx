import { roleLabels } from '@turnstone/contracts/role-names';
import type { Me } from '@turnstone/contracts/auth';
import { Button } from '../../../components/ui/button.tsx';
import { confirmLeaving } from '../../../lib/unsaved-changes.ts';
import { useSignOut } from '../api/sign-out.ts';

export function UserMenu({
  user,
  onSignedOut,
}: {
  user: Me;
  onSignedOut: () => void | Promise<void>;
}) {
  const signOut = useSignOut({ onSuccess: onSignedOut });
  return (
    <div className="flex items-center gap-3">
      <div className="text-right leading-tight">
        <p className="text-sm font-medium text-ink">{user.name}</p>
        <p className="text-xs text-ink-muted">{roleLabels[user.role]}</p>
      </div>
      <Button
        size="sm"
        onClick={() => void confirmLeaving().then((ok) => ok && signOut.mutate())}
        busy={signOut.isPending}
      >
        Sign out
      </Button>
      {signOut.error && (
        <p role="alert" className="max-w-48 text-xs text-status-danger">
          Sign-out failed: {signOut.error.message}
        </p>
      )}
    </div>
  );
}
