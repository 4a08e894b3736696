import { z } from 'zod'
import { LANGUAGES } from './languages'

// Apart from shared/utils/languages.ts, which the app's entry imports: a schema built at module load keeps zod in
// every chunk that imports its file, and the Scan page carries no zod.
/** A person's language setting: one of LANGUAGES, or null to follow the browser. */
export const languageSettingSchema = z.object({ language: z.enum(LANGUAGES).nullable() }).strict()
