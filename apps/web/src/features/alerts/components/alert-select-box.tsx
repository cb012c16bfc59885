import type { Row } from '@tanstack/react-table';
import type { Alert } from '@turnstone/contracts/alerts';
import { focusAcknowledgeNote } from './acknowledge-form.tsx';

/**
 * The checkbox that selects an alert for acknowledgement, in the table and in the cards.
 * Enter selects it and goes to the note, so the note is one key away. A click stays with the
 * box (the table row around it opens the alert on click).
 */
export function AlertSelectBox({ row, className }: { row: Row<Alert>; className: string }) {
  const a = row.original;
  return (
    <input
      type="checkbox"
      aria-label={`Select alert on ${a.pointTag}, ${a.bandName}`}
      className={className}
      checked={row.getIsSelected()}
      disabled={!row.getCanSelect()}
      onClick={(e) => e.stopPropagation()}
      onChange={row.getToggleSelectedHandler()}
      onKeyDown={(e) => {
        if (e.key !== 'Enter' || !row.getCanSelect()) return;
        e.preventDefault();
        if (!row.getIsSelected()) row.toggleSelected(true);
        focusAcknowledgeNote();
      }}
    />
  );
}
