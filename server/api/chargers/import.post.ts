// CSV import of chargers: dry run lists every bad row; a real run writes all or none (leads, admins).
export default defineEventHandler(event => importAssets(event, 'charger'))
