export * from './users'
export * from './plant'
export * from './samples'
export * from './audit'
