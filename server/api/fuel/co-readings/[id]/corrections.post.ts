import { coReadingCorrectionSchema } from '#shared/utils/correction-schemas'

// Correct one indoor CO reading, with the reason.
export default defineAbilityHandler('co.record', event => correctionRoute(event, coReadingCorrectionSchema, correctCoReading))
