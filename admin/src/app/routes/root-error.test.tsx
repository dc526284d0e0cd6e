import { render, screen } from '@testing-library/react';
import { RouterProvider, createMemoryRouter } from 'react-router-dom';
import { describe, expect, it, vi } from 'vitest';
import { RootErrorBoundary } from './root-error';

function Exploding(): never {
  throw new Error('render failed');
}

describe('RootErrorBoundary', () => {
  it('replaces a crashed page with a calm message and a way back', async () => {
    vi.spyOn(console, 'error').mockImplementation(() => {});
    vi.spyOn(console, 'warn').mockImplementation(() => {});
    const router = createMemoryRouter([
      { ErrorBoundary: RootErrorBoundary, children: [{ path: '/', Component: Exploding }] },
    ]);
    render(<RouterProvider router={router} />);

    expect(await screen.findByRole('heading', { name: 'Something went wrong' })).toBeInTheDocument();
    expect(screen.getByRole('alert')).toHaveTextContent('Your saved work is safe');
    expect(screen.getByRole('button', { name: 'Reload' })).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Go to the start page' })).toHaveAttribute('href', '/');
  });
});
