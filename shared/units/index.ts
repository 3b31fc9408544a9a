/**
 * Unit conversions and the unit-system tables. Naming rule used across `shared/`:
 * every number that carries a unit ends in its unit suffix — `In`, `Ft`, `Mm`, `M`,
 * `In2`, `Mm2`, `Kip`, `Kn`, `Ksi`, `Mpa`, `KipPerIn`, `KnPerMm`, `KipIn`, `KipFt`,
 * `KnM`, `Lb`, `Kg`, `LbPerFt`, `LbPerFt2`, `LbPerFt3`, `Deg`, `Rad`.
 */
export * from './constants'
export * from './length'
export * from './force'
export * from './stress'
export * from './area'
export * from './stiffness'
export * from './mass'
export * from './moment'
export * from './systems'
