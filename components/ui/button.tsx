import Link from 'next/link';
import type { ButtonHTMLAttributes, ComponentProps } from 'react';

type Variant = 'primary' | 'secondary' | 'ghost' | 'danger';

const base =
  'inline-flex items-center justify-center gap-2 rounded-md px-3.5 py-2 text-sm font-medium transition-colors disabled:cursor-not-allowed disabled:opacity-50';
const variants: Record<Variant, string> = {
  primary: 'bg-accent text-white hover:bg-accent-strong',
  secondary: 'border border-line-strong bg-paper-raised text-ink hover:bg-paper-sunk',
  ghost: 'text-ink-soft hover:bg-paper-sunk hover:text-ink',
  danger: 'bg-danger text-white hover:opacity-90',
};

export function buttonClass(variant: Variant = 'primary', extra = ''): string {
  return `${base} ${variants[variant]} ${extra}`;
}

export function Button({
  variant = 'primary',
  className = '',
  ...rest
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant }) {
  return <button type="button" {...rest} className={buttonClass(variant, className)} />;
}

export function ButtonLink({
  variant = 'primary',
  className = '',
  ...rest
}: ComponentProps<typeof Link> & { variant?: Variant }) {
  return <Link {...rest} className={buttonClass(variant, className)} />;
}
