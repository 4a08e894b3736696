import { refillCorrectionSchema } from '#shared/utils/correction-schemas'

// Correct a refill's weights, with the reason; a refused refill or figures that fail the fill are refused (409).
export default defineAbilityHandler('refill.record', event => correctionRoute(event, refillCorrectionSchema, correctRefill))
