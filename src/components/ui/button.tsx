import type { ButtonHTMLAttributes, ComponentProps } from 'react';
import { Link } from 'react-router';
import { cx } from '@/lib/cx';
import { Spinner } from './spinner';

export type ButtonVariant = 'primary' | 'secondary' | 'ghost' | 'danger' | 'inverse';
export type ButtonSize = 'sm' | 'md';

const variants: Record<ButtonVariant, string> = {
  primary: 'bg-ink-700 text-white hover:bg-ink-800 active:bg-ink-900 disabled:bg-ink-300',
  secondary: 'border border-ink-300 bg-white text-ink-800 hover:bg-ink-50 disabled:text-ink-300 disabled:border-ink-100',
  ghost: 'text-ink-700 hover:bg-ink-50 disabled:text-ink-300',
  danger: 'bg-red-700 text-white hover:bg-red-800 disabled:bg-red-300',
  /** On the dark header. */
  inverse: 'border border-ink-400 bg-transparent text-white hover:bg-ink-700 disabled:text-ink-300',
};
const sizes: Record<ButtonSize, string> = {
  sm: 'min-h-9 px-3 text-sm',
  md: 'min-h-11 px-4 text-base',
};

export function buttonClass(variant: ButtonVariant = 'primary', size: ButtonSize = 'md', extra?: string): string {
  return cx(
    'inline-flex items-center justify-center gap-2 rounded-md font-medium transition-colors disabled:cursor-not-allowed',
    variants[variant],
    sizes[size],
    extra,
  );
}

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: ButtonVariant;
  size?: ButtonSize;
  /** Shows a spinner and disables the button while an action runs. */
  pending?: boolean;
}

export function Button({ variant, size, pending = false, className, disabled, children, type = 'button', ...rest }: ButtonProps) {
  return (
    <button type={type} className={buttonClass(variant, size, className)} disabled={disabled || pending} aria-busy={pending || undefined} {...rest}>
      {pending && <Spinner size="sm" label="" />}
      {children}
    </button>
  );
}

export function ButtonLink({ variant, size, className, ...rest }: ComponentProps<typeof Link> & { variant?: ButtonVariant; size?: ButtonSize }) {
  return <Link className={buttonClass(variant, size, className)} {...rest} />;
}
