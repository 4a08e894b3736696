// Change a truck's battery (anyone at the site; an override needs a technician or lead and a written reason).
export default defineEventHandler((event): Promise<SwapAnswer> => recordBatterySwap(event))
