import { Button as HeadlessButton, type ButtonProps as HeadlessButtonProps } from '@headlessui/react';
import { cx } from './cx';
import { buttonRecipe } from './recipes';
import { Spinner } from './spinner';

export type ButtonVariant = keyof typeof buttonRecipe.variants;
export type ButtonSize = keyof typeof buttonRecipe.sizes;

export interface ButtonProps extends Omit<HeadlessButtonProps, 'className' | 'children'> {
  variant?: ButtonVariant;
  /** `compact` fits table rows. */
  size?: ButtonSize;
  className?: string;
  children?: React.ReactNode;
  /** Shows a spinner and disables the button while a request is in flight. */
  pending?: boolean;
}

export function Button({
  variant = 'secondary',
  size = 'regular',
  className,
  pending = false,
  disabled,
  children,
  type = 'button',
  ...props
}: ButtonProps) {
  return (
    <HeadlessButton
      type={type}
      disabled={disabled || pending}
      className={cx(buttonRecipe.base, buttonRecipe.sizes[size], buttonRecipe.variants[variant], className)}
      {...props}
    >
      {pending && <Spinner className="size-3.5" />}
      {children}
    </HeadlessButton>
  );
}
