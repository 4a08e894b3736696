// Edit a cylinder (leads and admins); the change is written to the audit log.
export default defineEventHandler(event => updateAsset(event, 'cylinder'))
