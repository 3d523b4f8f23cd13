import { config } from "zod";

// zod probes `new Function("")` to decide on compiled parsers; under our CSP (no 'unsafe-eval') the caught
// probe still fires a securitypolicyviolation on every page. The interpreted parser is fast enough in the browser.
config({ jitless: true });
