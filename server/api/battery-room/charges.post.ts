// Put a battery on a charger (technicians and leads).
export default defineAbilityHandler('charge.record', event => startChargeSession(event))
