import { cleanup } from '@testing-library/react';
import { afterEach } from 'vitest';

// Testing Library unmounts on its own only where the runner's hooks are globals; here they are not.
afterEach(cleanup);
