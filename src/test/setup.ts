/**
 * Setup for client component tests (the `client` vitest project lists it in setupFiles).
 * Vitest runs without globals, so Testing Library's automatic cleanup is registered here.
 */
import { cleanup } from '@testing-library/react';
import { afterEach, vi } from 'vitest';

// jsdom has no scrolling; React Router's <ScrollRestoration> calls it on every navigation.
if (typeof window !== 'undefined') window.scrollTo = () => undefined;

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});
