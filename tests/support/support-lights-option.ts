// The invented "lights on the supports" option both support-light cost tests save (API body of
// POST /api/v1/crossings/{id}/options): 2,500 a light, crane mobilisation 3,000, 45 min a light at
// 240 an hour, no discounting, so the arithmetic in the tests stays by hand.
export const TOWER_LIGHTS_OPTION = {
  name: "Lights on the towers",
  kind: "structure-supply",
  unitPrice: 2500,
  installationMethod: "crane",
  mobilisation: 3000,
  ratePerHour: 240,
  minutesPerUnit: 45,
  annualMaintenance: 400,
  serviceLifeYears: 20,
  horizonYears: 20,
  discountRatePercent: 0,
  feasibilityStatus: "go",
  feasibilityJustification: "Supply at both towers (test scenario).",
};
