import { Dialog, DialogBackdrop, DialogPanel, DialogTitle } from '@headlessui/react';
import type { ReactNode } from 'react';

type ModalDialogProps = {
  open: boolean;
  onClose: () => void;
  title: string;
  children: ReactNode;
};

/**
 * A dialog that rises from the bottom on a phone and sits centred on wider screens; Escape and the backdrop close it.
 * Nothing inside asks for focus, so focus starts on the dialog itself: it opens at its top and a screen reader
 * announces its title first.
 */
export function ModalDialog({ open, onClose, title, children }: ModalDialogProps) {
  return (
    <Dialog open={open} onClose={onClose} className="relative z-30">
      <DialogBackdrop className="fixed inset-0 bg-ink/50" />
      <div className="fixed inset-0 flex items-end justify-center overflow-y-auto p-3 sm:items-center sm:p-6">
        <DialogPanel className="flex max-h-full w-full max-w-lg flex-col gap-5 overflow-y-auto rounded-card bg-paper-raised p-6 shadow-card">
          <DialogTitle className="text-heading font-bold">{title}</DialogTitle>
          {children}
        </DialogPanel>
      </div>
    </Dialog>
  );
}
