import '@testing-library/jest-dom/vitest';
import { cleanup, configure } from '@testing-library/react';
import { afterEach, vi } from 'vitest';

// The machine is shared by several test runs at once; give findBy*/waitFor room before they give up.
// (A wait budget, not a speed assertion: passing tests finish as soon as the element appears.)
configure({ asyncUtilTimeout: 4000 });

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});
