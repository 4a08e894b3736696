// Record an electrolyte check and watering (technicians and leads).
export default defineEventHandler(event => recordElectrolyteCheck(event))
