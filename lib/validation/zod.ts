import { z } from 'zod';

// In the browser, zod builds its fast object parsers with `new Function` after
// probing whether eval is allowed; the pages' CSP allows no eval, and the probe,
// though caught, is reported as a CSP violation. Jitless parsing skips the probe.
// It must be set before any object schema is made, so every schema module
// imports `z` from here. The server keeps the compiled parsers.
if (typeof window !== 'undefined') z.config({ jitless: true });

export { z };
