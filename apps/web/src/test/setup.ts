import { configure } from '@testing-library/react';
import { afterEach, vi } from 'vitest';

// findBy*/waitFor give up after 1 s by default; on the shared, busy cores a route change after a mutation can take
// longer. Waiting longer changes no assertion: a condition that never holds still fails, only later.
configure({ asyncUtilTimeout: 5000 });

afterEach(() => {
  window.sessionStorage.clear();
  window.localStorage.clear();
  vi.unstubAllGlobals();
  vi.restoreAllMocks();
});
