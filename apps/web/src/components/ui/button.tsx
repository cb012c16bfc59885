import type { ComponentProps } from 'react';
import { cn } from '../../lib/cn.ts';
import { Spinner } from './spinner.tsx';

const variants = {
  primary:
    'bg-accent text-white hover:bg-accent-strong active:bg-accent-strong disabled:bg-ink-faint',
  secondary:
    'border border-line-strong bg-surface text-ink hover:bg-sunken disabled:text-ink-faint',
  ghost: 'text-ink-muted hover:bg-sunken hover:text-ink disabled:text-ink-faint',
} as const;

const sizes = {
  sm: 'h-8 px-2.5 text-[13px] gap-1.5',
  md: 'h-10 px-4 text-sm gap-2',
} as const;

export type ButtonProps = ComponentProps<'button'> & {
  variant?: keyof typeof variants;
  size?: keyof typeof sizes;
  /** Shows a spinner and disables the button while an action runs. */
  busy?: boolean;
};

export function Button({
  variant = 'secondary',
  size = 'md',
  busy = false,
  type = 'button',
  className,
  disabled,
  children,
  onClick,
  ...props
}: ButtonProps) {
  // Busy is aria-disabled, not disabled: a disabled button loses the keyboard focus.
  return (
    <button
      type={type}
      disabled={disabled}
      aria-disabled={busy || undefined}
      aria-busy={busy || undefined}
      onClick={(e) => {
        if (busy) e.preventDefault();
        else onClick?.(e);
      }}
      className={cn(
        'inline-flex shrink-0 items-center justify-center rounded-md font-medium whitespace-nowrap transition-colors disabled:cursor-not-allowed aria-disabled:cursor-progress',
        variants[variant],
        sizes[size],
        className,
      )}
      {...props}
    >
      {busy && <Spinner size="sm" className="text-current" />}
      {children}
    </button>
  );
}
