/**
 * Public API of the BRBF engineering engine. Pure functions, canonical units inside
 * (kip, in, ksi, in², kip/in, lb); `sizeFrame` converts from and to the request's unit system.
 */
export * from './errors'
export * from './geometry'
export * from './demand'
export * from './core-size'
export * from './capacity-basis'
export * from './adjusted-strength'
export * from './frame-forces'
export * from './stiffness'
export * from './weight'
export * from './code-tables'
export * from './size-frame-input'
export * from './size-frame-result'
export * from './size-frame'
