export {
  SPHERE_DOMAIN,
  MieWorkspace,
  seriesLength,
  sizeParameter,
  checkSphereDomain,
  sphereEfficiencies,
  efficienciesFromCoefficients
} from './sphere.ts'
export type { SphereEfficiencies } from './sphere.ts'
export { AngularTable, angularFromCoefficients, newAngularScattering } from './angles.ts'
export type { AngularScattering } from './angles.ts'
export { fillLogDerivative, fillLogDerivativeAndPsi, seriesFromLogDerivatives } from './sphere.ts'
export { CoatedWorkspace, coatedSphereEfficiencies } from './coated.ts'
