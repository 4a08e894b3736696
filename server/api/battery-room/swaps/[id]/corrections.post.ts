import { swapCorrectionSchema } from '#shared/utils/correction-schemas'

// Correct a battery change (another truck, battery or hour meter), with the reason; 201, or 200 for a repeat.
export default defineAbilityHandler('swap.record', event => correctionRoute(event, swapCorrectionSchema, correctBatterySwap))
