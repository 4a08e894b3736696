// Create a cylinder (leads and admins); issues its tag code in the same transaction.
export default defineAbilityHandler('asset.edit', event => createAsset(event, 'cylinder'))
