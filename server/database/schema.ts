// The whole data model. Units are US customary throughout (lb, in, °F, ft², ft³, cfm, US gal);
// sites choose metric for display and conversion happens at the edges (shared/utils/units.ts).
export * from './schema/enums'
export * from './schema/core'
export * from './schema/assets'
export * from './schema/battery-room'
export * from './schema/fuel'
export * from './schema/logs'
export * from './schema/read-models'
export * from './schema/jobs'
export * from './schema/inspection'
export * from './schema/reports'
export * from './schema/relations'
