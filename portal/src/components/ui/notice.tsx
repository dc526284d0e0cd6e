import type { ReactNode } from 'react';

type Tone = 'info' | 'success' | 'error';

const tones: Record<Tone, string> = {
  info: 'border-sand-deep bg-sand text-ink',
  success: 'border-moss bg-moss-tint text-moss-ink',
  error: 'border-ember bg-ember-tint text-ember',
};

/** A boxed message. Errors are announced at once (role=alert), the rest politely (role=status). */
export function Notice({ tone = 'info', title, children }: { tone?: Tone; title?: string; children?: ReactNode }) {
  return (
    <div role={tone === 'error' ? 'alert' : 'status'} className={`rounded-soft border-l-4 px-4 py-3 ${tones[tone]}`}>
      {title ? <p className="font-semibold">{title}</p> : null}
      {children ? <div className="text-fine text-ink">{children}</div> : null}
    </div>
  );
}
