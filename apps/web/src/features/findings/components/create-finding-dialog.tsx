import { useCreateFinding } from '../api/create-finding.ts';
import { emptyFindingForm, FindingFormDialog } from './finding-form-dialog.tsx';

/** Where a new finding comes from: a point, optionally its band or alert. */
export interface FindingOrigin {
  pointId: number;
  pointTag: string;
  alertId?: number | undefined;
  bandKey?: string | undefined;
  title: string;
  context: string;
}

/** Turns a review row (or an alert) into a finding, through the shared finding form. */
export function CreateFindingDialog({
  origin,
  onClose,
  onCreated,
}: {
  origin: FindingOrigin | null;
  onClose: () => void;
  onCreated?: (title: string) => void;
}) {
  const create = useCreateFinding();
  return (
    <FindingFormDialog
      open={origin !== null}
      heading="Create finding"
      headingId="create-finding-title"
      context={origin?.context}
      values={{ ...emptyFindingForm, title: origin?.title ?? '' }}
      submitLabel="Save finding"
      busy={create.isPending}
      error={create.error}
      onClose={() => {
        create.reset();
        onClose();
      }}
      onSubmit={async (values) => {
        if (!origin) return;
        const finding = await create.mutateAsync({
          pointId: origin.pointId,
          ...(origin.alertId !== undefined ? { alertId: origin.alertId } : {}),
          ...(origin.bandKey !== undefined ? { bandKey: origin.bandKey } : {}),
          ...values,
        });
        onCreated?.(finding.title);
        onClose();
      }}
    />
  );
}
