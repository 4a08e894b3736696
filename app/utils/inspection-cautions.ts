// The cautions the pre-shift check shows, by the truck's power (product.md, "Cautions shown in context"); keys of
// i18n/locales (caution.inspect_<power>.<what>), shown in the reader's language by UiCautions.
export const INSPECTION_CAUTIONS: Readonly<Record<'electric' | 'lp_gas', readonly string[]>> = {
  electric: ['caution.inspect_electric.walk_round', 'caution.inspect_electric.plug_handle', 'caution.inspect.critical_parked'],
  lp_gas: ['caution.inspect_lp_gas.walk_round', 'caution.inspect_lp_gas.gas_smell', 'caution.inspect.critical_parked'],
}
