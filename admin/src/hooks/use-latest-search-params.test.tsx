import { act, renderHook } from '@testing-library/react';
import type { ReactNode } from 'react';
import { MemoryRouter, useSearchParams } from 'react-router-dom';
import { describe, expect, it } from 'vitest';
import { useLatestSearchParams } from './use-latest-search-params';

const inRouter = ({ children }: { children: ReactNode }) => (
  <MemoryRouter initialEntries={['/audit']}>{children}</MemoryRouter>
);
const adding = (family: string) => (current: URLSearchParams) => {
  const next = new URLSearchParams(current);
  next.append('family', family);
  return next;
};

describe('useLatestSearchParams', () => {
  it('keeps both of two changes made before the page renders again', () => {
    const { result } = renderHook(() => useLatestSearchParams(), { wrapper: inRouter });
    act(() => {
      const [, update] = result.current;
      update(adding('other'));
      update(adding('steps'));
    });
    expect(result.current[0].getAll('family')).toEqual(['other', 'steps']);
  });

  it('shows why it exists: the router’s own updater, called twice from one render, loses the first change', () => {
    const { result } = renderHook(() => useSearchParams(), { wrapper: inRouter });
    act(() => {
      const [params, set] = result.current;
      set(adding('other')(params));
      set(adding('steps')(params));
    });
    expect(result.current[0].getAll('family')).toEqual(['steps']);
  });

  it('starts from the address again after it changed from elsewhere', () => {
    const { result } = renderHook(() => ({ latest: useLatestSearchParams(), router: useSearchParams() }), {
      wrapper: inRouter,
    });
    act(() => result.current.latest[1](adding('other')));
    act(() => result.current.router[1](new URLSearchParams()));
    act(() => result.current.latest[1](adding('steps')));
    expect(result.current.router[0].getAll('family')).toEqual(['steps']);
  });
});
