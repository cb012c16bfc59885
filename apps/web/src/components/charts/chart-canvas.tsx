import type { RefObject } from 'react';

/**
 * The box a chart draws into: an image to assistive technology, named by `ariaLabel` (the
 * chart's values are offered as a table beside it), full width at the given height.
 */
export function ChartCanvas({
  canvasRef,
  ariaLabel,
  height,
  className = 'w-full',
}: {
  canvasRef: RefObject<HTMLDivElement | null>;
  ariaLabel: string;
  height: number;
  className?: string;
}) {
  return (
    <div
      ref={canvasRef}
      role="img"
      aria-label={ariaLabel}
      className={className}
      style={{ height }}
    />
  );
}
