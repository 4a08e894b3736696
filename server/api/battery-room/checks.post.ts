// Record an electrolyte check and watering (technicians and leads).
export default defineEventHandler((event): Promise<CheckAnswer> => recordElectrolyteCheck(event))
