import { chargeCorrectionSchema } from '#shared/utils/correction-schemas'

// Correct a finished charge's figures, with the reason; an open charge is refused (409).
export default defineAbilityHandler('charge.record', event => correctionRoute(event, chargeCorrectionSchema, correctChargeSession))
