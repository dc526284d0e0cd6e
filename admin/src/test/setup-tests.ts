import '@testing-library/jest-dom/vitest';
import { cleanup, configure } from '@testing-library/react';
import { afterEach } from 'vitest';

// jsdom has no ResizeObserver; Headless UI's anchored panels ask for one.
class ResizeObserverStub {
  observe() {}
  unobserve() {}
  disconnect() {}
}
globalThis.ResizeObserver ??= ResizeObserverStub as unknown as typeof ResizeObserver;

// jsdom has no Web Animations API; Headless UI transitions only need to see that nothing is running.
Element.prototype.getAnimations ??= () => [];

// The test machines are shared and slow at times; debounced searches need more than the default 1 s to settle.
configure({ asyncUtilTimeout: 12_000 });

afterEach(() => cleanup());
