import { z } from 'zod';

// zod probes `new Function` once to speed up parsing; under our CSP (no eval) the probe is
// refused and reported as a violation, so the browser parses without it from the start.
z.config({ jitless: true });
