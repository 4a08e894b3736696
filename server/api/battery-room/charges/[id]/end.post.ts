// Take a battery off charge: amp-hours, end temperature, equalize, outcome (technicians and leads).
export default defineEventHandler((event): Promise<ChargeOffAnswer> => endChargeSession(event))
