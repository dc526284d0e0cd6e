import { useEffect, useId, useRef, useState } from 'react';
import SignaturePad from 'signature_pad';
import { Button } from '@/components/ui/button';
import { FieldError } from '@/components/ui/field-error';

type SignaturePadFieldProps = {
  /** The drawn mark as a PNG data URL, or '' for none. */
  onChange: (mark: string) => void;
  error?: string | undefined;
  disabled?: boolean;
};

/** Sharp on high-density screens without making the PNG needlessly large. */
const MAX_PIXEL_RATIO = 2;

/** An optional drawn mark: a finger, pen or mouse on a pad, with a way to clear it. The typed name is what signs. */
export function SignaturePadField({ onChange, error, disabled = false }: SignaturePadFieldProps) {
  const id = useId();
  const canvasRef = useRef<HTMLCanvasElement>(null);
  const padRef = useRef<SignaturePad | null>(null);
  const onChangeRef = useRef(onChange);
  onChangeRef.current = onChange;
  const [hasMark, setHasMark] = useState(false);
  const [unavailable, setUnavailable] = useState(false);

  useEffect(() => {
    const canvas = canvasRef.current;
    if (!canvas) return;
    let pad: SignaturePad;
    try {
      pad = new SignaturePad(canvas, {
        penColor: '#221a14',
        backgroundColor: 'rgba(0,0,0,0)',
        minWidth: 0.8,
        maxWidth: 2.6,
      });
    } catch {
      // No 2D canvas here (very old or locked-down browsers): the typed name alone signs.
      setUnavailable(true);
      return;
    }
    padRef.current = pad;

    const fitToScreen = () => {
      const ratio = Math.min(Math.max(window.devicePixelRatio || 1, 1), MAX_PIXEL_RATIO);
      const strokes = pad.toData();
      canvas.width = canvas.offsetWidth * ratio;
      canvas.height = canvas.offsetHeight * ratio;
      canvas.getContext('2d')?.scale(ratio, ratio);
      // Resizing a canvas wipes it; draw the strokes again so turning the phone keeps the mark.
      pad.fromData(strokes);
    };
    fitToScreen();

    const strokeEnded = () => {
      setHasMark(true);
      onChangeRef.current(pad.toDataURL('image/png'));
    };
    pad.addEventListener('endStroke', strokeEnded);
    window.addEventListener('resize', fitToScreen);
    return () => {
      pad.removeEventListener('endStroke', strokeEnded);
      window.removeEventListener('resize', fitToScreen);
      pad.off();
      padRef.current = null;
    };
  }, []);

  useEffect(() => {
    const pad = padRef.current;
    if (!pad) return;
    if (disabled) pad.off();
    else pad.on();
  }, [disabled]);

  const clear = () => {
    padRef.current?.clear();
    setHasMark(false);
    onChangeRef.current('');
  };

  if (unavailable) {
    return (
      <p className="rounded-soft bg-sand px-4 py-3 text-fine">
        Drawing a signature is not available in this browser. That is fine: your typed name is your signature.
      </p>
    );
  }

  return (
    <div className="flex flex-col gap-2">
      <p id={`${id}-label`} className="text-body font-semibold text-ink">
        Draw your signature <span className="font-normal text-ink-soft">(optional)</span>
      </p>
      <p id={`${id}-hint`} className="text-fine text-ink-soft">
        Use your finger, a pen or the mouse. You can skip this: your typed name is your signature.
      </p>
      <div className="relative">
        <canvas
          ref={canvasRef}
          role="img"
          aria-labelledby={`${id}-label`}
          aria-describedby={`${id}-hint`}
          data-has-mark={hasMark || undefined}
          className={`block h-44 w-full touch-none rounded-soft border-2 border-dashed bg-white ${
            error ? 'border-ember' : 'border-edge'
          }`}
        />
        {!hasMark ? (
          <span
            aria-hidden="true"
            className="pointer-events-none absolute inset-x-6 bottom-10 border-b-2 border-sand-deep"
          />
        ) : null}
      </div>
      <div className="flex items-center justify-between gap-3">
        <p className="text-fine text-ink-soft" aria-live="polite">
          {hasMark ? 'Drawing added.' : 'No drawing yet.'}
        </p>
        <Button variant="quiet" onClick={clear} disabled={!hasMark || disabled}>
          Clear the drawing
        </Button>
      </div>
      {error ? <FieldError>{error}</FieldError> : null}
    </div>
  );
}
