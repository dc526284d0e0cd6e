import { render, screen } from '@testing-library/react';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { describe, expect, it, vi } from 'vitest';
import { RootErrorBoundary, RootLayout } from './root';

function Broken(): never {
  throw new Error('A page crashed while drawing');
}

describe('root error boundary', () => {
  it('replaces a crashed page with a plain apology and ways out', async () => {
    const consoleError = vi.spyOn(console, 'error').mockImplementation(() => {});
    const router = createMemoryRouter(
      [{ element: <RootLayout />, errorElement: <RootErrorBoundary />, children: [{ path: '/', Component: Broken }] }],
      { initialEntries: ['/'] },
    );
    render(<RouterProvider router={router} />);

    expect(await screen.findByRole('heading', { name: 'Sorry, something went wrong' })).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Reload the page' })).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Go to the start' })).toHaveAttribute('href', '/');
    expect(screen.queryByText('A page crashed while drawing')).not.toBeInTheDocument();
    expect(consoleError).toHaveBeenCalled();
  });
});
