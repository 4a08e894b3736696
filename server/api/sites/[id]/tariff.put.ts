import { siteTariffSchema } from '#shared/utils/tariff'

// Set a site's electricity prices and peak windows (its facilities lead or an admin).
export default defineAbilityHandler('site.tariff', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, siteTariffSchema)
  const actor = await requireAbility(event, 'site.tariff', id)
  return { item: await setSiteTariff(actor, id, body) }
})
