import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/states';
import { TextAreaField } from '@/components/ui/text-area-field';
import { TextField } from '@/components/ui/text-field';
import { applyServerErrors } from '@/lib/form-server-errors';
import { staffMessageInputSchema, useSendStaffMessage, type StaffMessageInput } from '../api/send-staff-message';

export interface SendMessageDialogProps {
  studyId: string;
  enrollmentId: string;
  reference: string;
  email: string;
  open: boolean;
  onClose: () => void;
  onSent: () => void;
}

/** Give it a new `key` each time it opens, so each message starts empty. */
export function SendMessageDialog({
  studyId,
  enrollmentId,
  reference,
  email,
  open,
  onClose,
  onSent,
}: SendMessageDialogProps) {
  return (
    <ModalDialog
      open={open}
      onClose={onClose}
      size="wide"
      title={`Send a message to ${reference}`}
      description={`E-mailed to ${email} and logged as a staff message in the contact log, which the dropout watch compares across conditions. Never mention the participant’s condition.`}
    >
      <MessageForm studyId={studyId} enrollmentId={enrollmentId} onCancel={onClose} onSent={onSent} />
    </ModalDialog>
  );
}

function MessageForm({
  studyId,
  enrollmentId,
  onCancel,
  onSent,
}: {
  studyId: string;
  enrollmentId: string;
  onCancel: () => void;
  onSent: () => void;
}) {
  const send = useSendStaffMessage(studyId, enrollmentId);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<StaffMessageInput>({
    resolver: zodResolver(staffMessageInputSchema),
    defaultValues: { subject: '', message: '' },
  });

  const onSubmit = handleSubmit((body) =>
    send.mutate(body, {
      onSuccess: () => onSent(),
      onError: (error) => applyServerErrors(error, ['subject', 'message'], setError),
    }),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3" aria-label="Message to the participant">
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      <TextField label="Subject" autoComplete="off" error={errors.subject?.message} {...register('subject')} />
      <TextAreaField label="Message" rows={7} error={errors.message?.message} {...register('message')} />
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" pending={send.isPending}>
          Send message
        </Button>
      </DialogActions>
    </form>
  );
}
