// The cautions the pre-shift check shows, by the truck's power (product.md, "Cautions shown in context").
export const INSPECTION_CAUTIONS: Readonly<Record<'electric' | 'lp_gas', readonly string[]>> = {
  electric: [
    'Walk round with the forks down, controls in neutral and the parking brake set.',
    'Pull the battery plug by its handle, never by the cable.',
    'A failed item marked critical means the truck stays parked until it is put right.',
  ],
  lp_gas: [
    'Walk round with the forks down, engine off and the parking brake set.',
    'Smell gas? Do not start the engine: close the cylinder valve, keep flames and sparks away, tell a lead.',
    'A failed item marked critical means the truck stays parked until it is put right.',
  ],
}
