import type { Finding } from '@turnstone/contracts/findings';
import { useUpdateFinding } from '../api/update-finding.ts';
import { FindingFormDialog } from './finding-form-dialog.tsx';

/**
 * Edits a finding after it was created: priority, owner, planned downtime and the rest of the
 * form. The whole form goes as one `PATCH`; the server writes and audits what changed.
 */
export function EditFindingDialog({
  finding,
  onClose,
}: {
  finding: Finding | null;
  onClose: () => void;
}) {
  const update = useUpdateFinding();
  return (
    <FindingFormDialog
      open={finding !== null}
      heading="Edit finding"
      headingId="edit-finding-title"
      context={finding ? `${finding.pointTag} · ${finding.machineName}` : undefined}
      values={{
        title: finding?.title ?? '',
        workOrderRef: finding?.workOrderRef ?? '',
        dueDate: finding?.dueDate ?? '',
        note: finding?.note ?? '',
        priority: finding?.priority ?? 'medium',
        owner: finding?.owner ?? '',
        plannedDowntimeHours:
          finding?.plannedDowntimeHours == null ? '' : String(finding.plannedDowntimeHours),
      }}
      submitLabel="Save changes"
      busy={update.isPending}
      error={update.error}
      onClose={() => {
        update.reset();
        onClose();
      }}
      onSubmit={async (values) => {
        if (!finding) return;
        await update.mutateAsync({ id: finding.id, ...values });
        update.reset();
        onClose();
      }}
    />
  );
}
