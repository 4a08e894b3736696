import { electrolyteCorrectionSchema } from '#shared/utils/correction-schemas'

// Correct an electrolyte check's level, water or readings, with the reason.
export default defineAbilityHandler('reading.record', event => correctionRoute(event, electrolyteCorrectionSchema, correctElectrolyteCheck))
