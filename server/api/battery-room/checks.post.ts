// Record an electrolyte check and watering (technicians and leads).
export default defineAbilityHandler('reading.record', event => recordElectrolyteCheck(event))
