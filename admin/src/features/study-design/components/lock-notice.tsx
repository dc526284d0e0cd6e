import { Notice } from '@/components/ui/states';
import { lockExplanations, type DesignLock } from './design-lock';

export function LockNotice({ lock, children }: { lock: DesignLock; children?: React.ReactNode }) {
  if (!lock) return null;
  return (
    <Notice tone="info" className="mb-3">
      <span className="font-semibold">Read-only. </span>
      {lockExplanations[lock]}
      {children && <> {children}</>}
    </Notice>
  );
}
