// Put a battery on a charger (technicians and leads).
export default defineEventHandler((event): Promise<ChargeOnAnswer> => startChargeSession(event))
