// Put a charger out of service or back in service, with the reason (technicians, leads, admins).
export default defineAbilityHandler('asset.hold', event => setAssetOutOfService(event, 'charger'))
