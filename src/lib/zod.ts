import { z } from 'zod';

/**
 * zod for the whole app. In the browser it runs without compiling parsers (`jitless`): its
 * compiled fast path first probes `new Function`, which the Content-Security-Policy rightly
 * blocks, and the probe is reported as a violation on every page that checks a form. On the server
 * (no such policy) the compiled path stays: it checks a large build document faster.
 */
if (typeof window !== 'undefined') z.config({ jitless: true });

export { z };
