// CSV import of cylinders: dry run lists every bad row; a real run writes all or none (leads, admins).
export default defineAbilityHandler('asset.edit', event => importAssets(event, 'cylinder'))
