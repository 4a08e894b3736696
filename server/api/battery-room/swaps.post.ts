// Change a truck's battery (anyone at the site; an override needs a technician or lead and a written reason).
export default defineAbilityHandler('swap.record', event => recordBatterySwap(event))
