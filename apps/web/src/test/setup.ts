import { configure } from '@testing-library/react';
import { afterEach, vi } from 'vitest';

// findBy*/waitFor poll until their condition holds; the library's 1 s default is shorter than the first lazy page
// import takes on the shared 2-core machine under load (the first case of a file timed out). The tests' own 20 s
// timeout still bounds a condition that never holds.
configure({ asyncUtilTimeout: 8000 });

afterEach(() => {
  window.sessionStorage.clear();
  window.localStorage.clear();
  vi.unstubAllGlobals();
  vi.restoreAllMocks();
});
