import type { ReactNode } from 'react';
import { Link, type LinkProps } from 'react-router-dom';
import { paths } from '../../config/paths.ts';
import { cn } from '../../lib/cn.ts';

/** A link within text or a table: the accent colour, underlined on hover. */
export function TextLink({ className, ...link }: LinkProps) {
  return (
    <Link className={cn('text-accent underline-offset-2 hover:underline', className)} {...link} />
  );
}

/**
 * A point as a table row names it: its tag or name linked to its page, and a line of detail
 * below (its machine, or its tag and direction). A tag is set in the monospaced face.
 */
export function PointLabel({
  pointId,
  title,
  titleIs,
  detail,
}: {
  pointId: number;
  title: string;
  titleIs: 'tag' | 'name';
  detail: ReactNode;
}) {
  const byTag = titleIs === 'tag';
  return (
    <>
      <TextLink
        to={paths.app.point.getHref(pointId)}
        className={byTag ? 'font-mono font-medium whitespace-nowrap' : 'font-medium'}
      >
        {title}
      </TextLink>
      <div className={cn('text-xs text-ink-muted', !byTag && 'font-mono')}>{detail}</div>
    </>
  );
}
