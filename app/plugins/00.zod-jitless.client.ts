import { z } from 'zod'

// zod compiles fast parsers with `new Function` unless told not to, and probes for that on
// each object schema: under Barsmith's content security policy (no 'unsafe-eval') the probe is
// a policy violation. Set before any schema is built (plugins load before the pages' chunks).
z.config({ jitless: true })

export default defineNuxtPlugin(() => {})
