import { emissionsCorrectionSchema } from '#shared/utils/correction-schemas'

// Correct an emissions test's figures; the verdict and next date follow.
export default defineAbilityHandler('emissions.record', event => correctionRoute(event, emissionsCorrectionSchema, correctEmissionsTest))
