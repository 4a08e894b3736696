import type { EntryQuantity } from '#shared/utils/units'
// Labels and sources for the site policy form (their words in every language: site.setting.* and site.setting_source.*); values are validated by siteSettingsSchema. Intervals
// (watering, equalize, inspections, emissions retests, due-soon windows) are set on the Schedules page.
// A setting with a `quantity` is stored in US units and typed and shown in the site's (`{unit}` in its label).
export const SITE_SETTING_VIEWS: { key: keyof SiteSettings, label: string, source: string, step?: string, quantity?: EntryQuantity }[] = [
  { key: 'coolDownMinutes', label: 'Cool-down after charge (minutes)', source: '8 h work / 8 h charge / 8 h cool — common practice' },
  { key: 'sgReferenceTempF', label: 'Specific-gravity reference temperature ({unit})', source: 'US Army TM 5-1185 tables are referenced to 80 °F; metric sites 25 °C (77 °F), common practice', quantity: 'temperature', step: '0.1' },
  { key: 'sgCorrectionPerDegF', label: 'Specific-gravity correction per °F', source: '0.004 per 10 °F, published in several battery manuals', step: '0.0001' },
  { key: 'cellSpreadThreshold', label: 'Weak-cell threshold below the mean', source: '0.020 — common practice for motive batteries', step: '0.001' },
  { key: 'maxChargeTempF', label: 'Highest end-of-charge temperature ({unit})', source: '110–115 °F (43–46 °C) — from memory; follow the battery maker', quantity: 'temperature', step: '0.1' },
  { key: 'tariffPerKwh', label: 'Electricity tariff per kWh', source: 'your utility bill', step: '0.001' },
  { key: 'propanePerGal', label: 'Propane price per US gallon (0: not entered)', source: 'your supplier\'s invoice', step: '0.01' },
  { key: 'fullCylinderReorderAt', label: 'Reorder hint below N full cylinders', source: 'site choice' },
  { key: 'emissionsMaxCoPctLp', label: 'Tailpipe CO limit, LP-gas (%)', source: 'Minnesota Rules 5205.0116', step: '0.1' },
  { key: 'emissionsMaxCoPctGasoline', label: 'Tailpipe CO limit, gasoline (%)', source: 'Minnesota Rules 5205.0116', step: '0.1' },
  { key: 'coSiteLimitPpm', label: 'Indoor CO site limit, 8-h TWA (ppm)', source: 'NIOSH REL 35 ppm' },
  { key: 'requalYearsWaterJacket', label: 'Requalification years — water jacket', source: '49 CFR 180.209' },
  { key: 'requalYearsProofPressure', label: 'Requalification years — proof pressure', source: '49 CFR 180.209 (from memory)' },
  { key: 'requalYearsExternalVisual', label: 'Requalification years — external visual', source: '49 CFR 180.209' },
  { key: 'digestHour', label: 'Daily digest e-mail at (site hour, 0–23)', source: 'site choice' },
  { key: 'correctionWindowDays', label: 'Records correctable by their recorders for (days; later only leads)', source: 'site choice' },
]
