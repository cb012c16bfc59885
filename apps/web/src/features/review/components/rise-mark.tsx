import { StrokePath } from '../../../components/ui/icon.tsx';

/**
 * The review's rise marker: an open upward arrow in the ink colour — not the filled triangle
 * that marks an alert, so a rise never reads as an alert.
 */
export function RiseMark() {
  return (
    <svg
      viewBox="0 0 12 12"
      aria-hidden="true"
      className="mr-1 inline size-3 align-[-1px] text-ink"
    >
      <StrokePath d="M6 10.5V2M2.5 5.5 6 2l3.5 3.5" />
    </svg>
  );
}
