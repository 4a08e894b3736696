import { exchangeCorrectionSchema } from '#shared/utils/correction-schemas'

// Correct a cylinder change (hour meter, or the cylinder that went on when it is the truck's latest change).
export default defineAbilityHandler('cylinder.exchange', event => correctionRoute(event, exchangeCorrectionSchema, correctCylinderExchange))
