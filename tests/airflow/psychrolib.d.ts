// Minimal types for the parts of psychrolib (ASHRAE psychrometric reference implementation) used as a test oracle.
declare module "psychrolib" {
  interface Psychrolib {
    readonly SI: number;
    readonly IP: number;
    SetUnitSystem(unitSystem: number): void;
    GetSatVapPres(tDryBulb: number): number;
    GetHumRatioFromRelHum(tDryBulb: number, relHum: number, pressure: number): number;
    GetHumRatioFromTWetBulb(tDryBulb: number, tWetBulb: number, pressure: number): number;
    GetStandardAtmPressure(altitude: number): number;
    GetMoistAirDensity(tDryBulb: number, humRatio: number, pressure: number): number;
  }
  const psychrolib: Psychrolib;
  export default psychrolib;
}
