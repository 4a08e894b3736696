// One truck the user can see, with their roles at its site.
export default defineAbilityHandler('site.member', event => getAsset(event, 'truck'))
