// Create a area (leads and admins); issues its tag code in the same transaction.
export default defineEventHandler(event => createAsset(event, 'area'))
