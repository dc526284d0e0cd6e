import { useEffect, useState } from 'react';
import { Button } from './button';

/** Selects the text of an input, or of any other element, so the person can copy it by hand. */
function selectText(target: HTMLElement): void {
  if (target instanceof HTMLInputElement || target instanceof HTMLTextAreaElement) {
    target.focus();
    target.select();
    return;
  }
  const range = document.createRange();
  range.selectNodeContents(target);
  const selection = window.getSelection();
  selection?.removeAllRanges();
  selection?.addRange(range);
}

export interface CopyButtonProps {
  value: string;
  label?: string;
  /** Where the value is shown: selected when the browser refuses the clipboard, so it can be copied by hand. */
  fallbackTarget?: React.RefObject<HTMLElement | null>;
  /** Names the button for assistive technology when the visible label alone is ambiguous. */
  'aria-label'?: string;
}

/** Copies a value to the clipboard and says so for a moment, also to screen readers. */
export function CopyButton({ value, label = 'Copy', fallbackTarget, 'aria-label': ariaLabel }: CopyButtonProps) {
  const [state, setState] = useState<'idle' | 'copied' | 'failed'>('idle');

  useEffect(() => {
    if (state !== 'copied') return;
    const timer = setTimeout(() => setState('idle'), 2500);
    return () => clearTimeout(timer);
  }, [state]);

  const copy = async () => {
    try {
      if (!navigator.clipboard) throw new Error('no clipboard');
      await navigator.clipboard.writeText(value);
      setState('copied');
    } catch {
      if (fallbackTarget?.current) selectText(fallbackTarget.current);
      setState('failed');
    }
  };

  return (
    <span className="inline-flex items-center gap-2">
      <Button size="compact" onClick={() => void copy()} aria-label={ariaLabel}>
        {label}
      </Button>
      <span aria-live="polite" className="text-xs text-ink-muted">
        {state === 'copied'
          ? 'Copied'
          : state === 'failed'
            ? fallbackTarget
              ? 'The browser blocked copying; the text is selected, press Ctrl+C (⌘C on a Mac).'
              : 'Copying was blocked; select the text instead.'
            : ''}
      </span>
    </span>
  );
}
