import { requalificationCorrectionSchema } from '#shared/utils/correction-schemas'

// Correct a requalification's method or marking; pass or fail is refused (409).
export default defineAbilityHandler('cylinder.requalify', event => correctionRoute(event, requalificationCorrectionSchema, correctRequalification))
