import { useEffect, useState } from 'react';
import { Button } from './button';

/** Copies a value to the clipboard and says so for a moment, also to screen readers. */
export function CopyButton({ value, label = 'Copy' }: { value: string; label?: string }) {
  const [state, setState] = useState<'idle' | 'copied' | 'failed'>('idle');

  useEffect(() => {
    if (state === 'idle') return;
    const timer = setTimeout(() => setState('idle'), 2500);
    return () => clearTimeout(timer);
  }, [state]);

  const copy = async () => {
    try {
      await navigator.clipboard.writeText(value);
      setState('copied');
    } catch {
      setState('failed');
    }
  };

  return (
    <span className="inline-flex items-center gap-2">
      <Button size="compact" onClick={() => void copy()}>
        {label}
      </Button>
      <span aria-live="polite" className="text-xs text-ink-muted">
        {state === 'copied' ? 'Copied' : state === 'failed' ? 'Copying was blocked; select the text instead.' : ''}
      </span>
    </span>
  );
}
