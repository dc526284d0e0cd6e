import { fireEvent } from '@testing-library/react';
import { vi } from 'vitest';

/** A 1×1 transparent PNG as a data URL: what the stubbed canvas "draws". */
export const stubMark =
  'data:image/png;base64,iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAQAAAC1HAwCAAAAC0lEQVR42mNkYAAAAAYAAjCB0C8AAAAASUVORK5CYII=';

/**
 * jsdom has no 2D canvas. This gives every canvas a context that accepts any drawing call and remembers nothing,
 * and a toDataURL that returns a small real PNG, so the signature pad runs as it does in a browser.
 */
export function stubCanvas() {
  const context = new Proxy({} as Record<string | symbol, unknown>, {
    get: (target, property) => (property in target ? target[property] : () => undefined),
    set: (target, property, value) => {
      target[property] = value;
      return true;
    },
  });
  vi.spyOn(HTMLCanvasElement.prototype, 'getContext').mockImplementation(
    () => context as unknown as CanvasRenderingContext2D,
  );
  vi.spyOn(HTMLCanvasElement.prototype, 'toDataURL').mockImplementation(() => stubMark);
}

/** One stroke across the pad, as a finger or mouse would make it. */
export function drawStroke(canvas: HTMLElement) {
  fireEvent.pointerDown(canvas, { pointerId: 1, buttons: 1, clientX: 20, clientY: 60, pressure: 0.5 });
  fireEvent.pointerMove(canvas, { pointerId: 1, buttons: 1, clientX: 80, clientY: 40, pressure: 0.5 });
  fireEvent.pointerMove(canvas, { pointerId: 1, buttons: 1, clientX: 140, clientY: 70, pressure: 0.5 });
  fireEvent.pointerUp(canvas, { pointerId: 1, buttons: 0, clientX: 140, clientY: 70 });
}
