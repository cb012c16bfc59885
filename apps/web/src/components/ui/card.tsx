import type { ComponentProps } from 'react';
import { cn } from '../../lib/cn.ts';

export function Card({ className, ...props }: ComponentProps<'div'>) {
  return (
    <div
      className={cn(
        'rounded-lg border border-line bg-surface shadow-[0_1px_0_rgb(0_0_0/0.03)]',
        className,
      )}
      {...props}
    />
  );
}
