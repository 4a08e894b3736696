// CSV import of areas: dry run lists every bad row; a real run writes all or none (leads, admins).
export default defineEventHandler(event => importAssets(event, 'area'))
