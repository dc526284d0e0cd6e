import { Dialog, DialogBackdrop, DialogPanel, DialogTitle, Description } from '@headlessui/react';
import { cx } from './cx';
import { dialogRecipe } from './recipes';

export interface ModalDialogProps {
  open: boolean;
  onClose: () => void;
  title: string;
  description?: React.ReactNode;
  children: React.ReactNode;
  /** Role for assistive technology: confirmations ask for a decision. */
  role?: 'dialog' | 'alertdialog';
  /** Wide: for long forms; it also starts nearer the top so more of the form shows at once. */
  size?: 'narrow' | 'wide';
}

export function ModalDialog({
  open,
  onClose,
  title,
  description,
  children,
  role = 'dialog',
  size = 'narrow',
}: ModalDialogProps) {
  const wide = size === 'wide';
  return (
    <Dialog open={open} onClose={onClose} role={role} transition className="relative z-50">
      <DialogBackdrop transition className={dialogRecipe.backdrop} />
      <div className={cx(dialogRecipe.frame, wide && 'pt-[6vh]!')}>
        <DialogPanel transition className={cx(dialogRecipe.panel, wide && 'max-w-2xl!')}>
          <div className="border-b border-line px-5 pt-4 pb-3">
            <DialogTitle className={dialogRecipe.title}>{title}</DialogTitle>
            {description && <Description className={dialogRecipe.description}>{description}</Description>}
          </div>
          <div className="px-5 py-4">{children}</div>
        </DialogPanel>
      </div>
    </Dialog>
  );
}

/** The button row at the bottom of a dialog. */
export function DialogActions({ children }: { children: React.ReactNode }) {
  return (
    <div className="-mx-5 -mb-4 mt-5 flex justify-end gap-2 border-t border-line bg-canvas px-5 py-3 rounded-b-lg">
      {children}
    </div>
  );
}
