// One area the user can see, with their roles at its site.
export default defineEventHandler(event => getAsset(event, 'area'))
