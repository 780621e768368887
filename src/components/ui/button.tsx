import type { ComponentProps } from 'react';
import { cn } from '@/lib/cn';
import { Spinner } from './spinner';

const variants = {
  primary: 'bg-spruce-600 text-white hover:bg-spruce-700 active:bg-spruce-800 shadow-sm',
  secondary: 'border border-ink-line bg-paper-raised text-ink hover:bg-paper-sunken hover:border-ink-faint',
  ghost: 'text-spruce-700 hover:bg-spruce-50',
  danger: 'bg-brick-solid text-white hover:bg-brick-deep shadow-sm',
  /** For the dark header. */
  inverse: 'border border-spruce-600 bg-spruce-800 text-paper hover:border-spruce-300 hover:bg-spruce-700',
} as const;

const sizes = {
  sm: 'h-8 gap-1.5 px-3 text-sm',
  md: 'h-10 gap-2 px-4 text-sm',
  lg: 'h-12 gap-2 px-5 text-base',
} as const;

export type ButtonVariant = keyof typeof variants;
export type ButtonSize = keyof typeof sizes;

/** The button look, for router links that should read as actions. */
export function buttonClasses({ variant = 'primary', size = 'md', className }: { variant?: ButtonVariant; size?: ButtonSize; className?: string } = {}) {
  return cn(
    'focus-ring inline-flex shrink-0 items-center justify-center rounded-control font-semibold transition-colors',
    'disabled:cursor-not-allowed disabled:opacity-60',
    variants[variant],
    sizes[size],
    className,
  );
}

export interface ButtonProps extends ComponentProps<'button'> {
  variant?: ButtonVariant;
  size?: ButtonSize;
  /** Disables the button and shows a spinner, keeping the label so it stays readable. */
  isLoading?: boolean;
}

export function Button({ variant, size, isLoading = false, disabled, className, children, type = 'button', ...props }: ButtonProps) {
  return (
    <button
      type={type}
      disabled={disabled || isLoading}
      aria-busy={isLoading || undefined}
      className={buttonClasses({ variant, size, className })}
      {...props}
    >
      {isLoading ? <Spinner size="sm" /> : null}
      {children}
    </button>
  );
}
