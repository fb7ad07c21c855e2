// Imported first by main.tsx, before any schema is parsed. The content security policy forbids
// eval; without this setting zod probes for it (and the browser reports a violation) to compile
// faster object parsers.
import { z } from 'zod';

z.config({ jitless: true });
