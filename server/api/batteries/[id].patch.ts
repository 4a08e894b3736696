// Edit a battery (leads and admins); the change is written to the audit log.
export default defineAbilityHandler('asset.edit', event => updateAsset(event, 'battery'))
