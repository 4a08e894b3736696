import type { AssetView } from '~/utils/asset-views'

// An asset kind's list and form in the reader's language: names, column, filter and field labels, hints and the
// options of closed sets (asset_list.<kind>.*, asset_form.<kind>.*, asset_list.option.*). Words the locale
// files lack stay as asset-views.ts writes them.
const snake = (key: string) => key.replace(/[A-Z]/g, c => `_${c.toLowerCase()}`)
const OPTION_KEY: Record<string, (value: string) => string> = {
  power: v => `asset_list.option.power.${v}`,
  truckClass: v => `asset_list.option.truck_class.${v}`,
  outOfService: v => `asset_list.option.service.${v}`,
  chemistry: v => `asset_list.option.chemistry.${v}`,
  allowedChemistries: v => `asset_list.option.chemistry.${v}`,
  chemistryProfiles: v => `asset_list.option.chemistry.${v}`,
  chargerType: v => `asset_list.option.charger_type.${v}`,
  specification: v => `asset_list.option.cylinder_spec.${v}`,
  state: v => `asset_state.${v}`,
  status: v => `asset_state.${v}`,
  lastRequalificationMethod: v => `requalify.method_${v}`,
  kind: v => `asset_list.option.area_kind.${v}`,
}

export function useAssetViewWords() {
  const { t, te } = useNuxtApp().$i18n
  const word = (key: string, english: string) => (te(key) ? t(key) : english)
  const options = (key: string, given?: Record<string, string>) => {
    const keyOf = OPTION_KEY[key]
    return given && keyOf ? Object.fromEntries(Object.entries(given).map(([v, english]) => [v, word(keyOf(v), english)])) : given
  }
  function localView(view: AssetView): AssetView {
    const k = view.kind
    return {
      ...view,
      noun: word(`asset_list.${k}.noun`, view.noun),
      plural: word(`asset_list.${k}.plural`, view.plural),
      columns: view.columns.map(c => ({ ...c, label: word(`asset_list.${k}.col.${snake(c.key)}`, c.label), options: options(c.key, c.options) })),
      filters: view.filters.map(f => ({ ...f, label: word(`asset_list.${k}.filter.${snake(f.key)}`, f.label), options: options(f.key, f.options)! })),
      fields: view.fields.map(f => ({
        ...f, label: word(`asset_form.${k}.${snake(f.key)}`, f.label),
        hint: f.hint && word(`asset_form.${k}.${snake(f.key)}_hint`, f.hint), options: options(f.key, f.options),
      })),
    }
  }
  return { localView }
}
