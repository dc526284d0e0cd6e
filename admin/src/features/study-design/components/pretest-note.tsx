import { Notice } from '@/components/ui/states';

/** Why a numeric pretest stratifies and never decides the condition by cut-off; the words come from the api. */
export function PretestNote({ note }: { note: string }) {
  return (
    <Notice tone="info">
      <p className="font-semibold">A pretest balances the assignment; it never decides it</p>
      <p className="mt-1">{note}</p>
    </Notice>
  );
}
