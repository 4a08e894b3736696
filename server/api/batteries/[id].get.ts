// One battery the user can see, with their roles at its site.
export default defineEventHandler(event => getAsset(event, 'battery'))
