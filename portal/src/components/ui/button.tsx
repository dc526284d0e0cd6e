import { Button as HeadlessButton, type ButtonProps as HeadlessButtonProps } from '@headlessui/react';
import { Link, type LinkProps } from 'react-router-dom';

export type ButtonVariant = 'primary' | 'secondary' | 'quiet';

const base =
  'inline-flex min-h-12 items-center justify-center gap-2 rounded-soft px-5 py-3 text-body font-semibold ' +
  'transition-colors duration-150 select-none cursor-pointer ' +
  'data-disabled:cursor-not-allowed data-disabled:opacity-60';

const variants: Record<ButtonVariant, string> = {
  primary: 'bg-clay text-white shadow-card data-hover:bg-clay-deep data-active:bg-clay-deep',
  secondary: 'border-2 border-clay bg-paper-raised text-clay-ink data-hover:bg-clay-tint data-active:bg-clay-tint',
  quiet: 'text-clay-ink underline decoration-2 underline-offset-4 data-hover:bg-clay-tint px-3',
};

/** Class recipe shared by buttons and links that look like buttons. */
export function buttonClasses(variant: ButtonVariant = 'primary', extra = ''): string {
  return `${base} ${variants[variant]} ${extra}`.trim();
}

type ButtonProps = Omit<HeadlessButtonProps, 'className'> & {
  variant?: ButtonVariant;
  className?: string;
  wide?: boolean;
};

export function Button({ variant = 'primary', className = '', wide = false, type = 'button', ...props }: ButtonProps) {
  return (
    <HeadlessButton type={type} className={buttonClasses(variant, `${wide ? 'w-full' : ''} ${className}`)} {...props} />
  );
}

type ButtonLinkProps = LinkProps & { variant?: ButtonVariant; wide?: boolean };

// Buttons and button-links share the one :focus-visible outline from index.css (no focus style of their own).
export function ButtonLink({ variant = 'primary', className = '', wide = false, ...props }: ButtonLinkProps) {
  return <Link className={buttonClasses(variant, `${wide ? 'w-full' : ''} ${className}`)} {...props} />;
}
