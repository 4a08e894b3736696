// Take a battery off charge: amp-hours, end temperature, equalize, outcome (technicians and leads).
export default defineAbilityHandler('charge.record', event => endChargeSession(event))
