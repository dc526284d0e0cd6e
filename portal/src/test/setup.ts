import '@testing-library/jest-dom/vitest';
import { cleanup, configure } from '@testing-library/react';
import { afterEach } from 'vitest';

// Waits for the screen to settle; generous because CI machines are shared.
configure({ asyncUtilTimeout: 12_000 });

// jsdom has no ResizeObserver; Headless UI measures with it.
class ResizeObserverStub {
  observe() {}
  unobserve() {}
  disconnect() {}
}
globalThis.ResizeObserver ??= ResizeObserverStub as unknown as typeof ResizeObserver;

// jsdom does not scroll, and its object URLs take only its own Blob, not the one fetch gives; the portal uses both.
window.scrollTo = () => {};
let objectUrls = 0;
URL.createObjectURL = () => `blob:http://localhost/evenhand-test-${(objectUrls += 1)}`;
URL.revokeObjectURL = () => {};

afterEach(() => {
  cleanup();
  localStorage.clear();
});
