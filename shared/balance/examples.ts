/**
 * Invented, known-good vehicles of the demo scenario (team-rules.md). The
 * numbers are plausible for their class, not measurements of any real car.
 * Used by tests, the demo seed, the CLI fixtures and the UI.
 */
import { VEHICLE_FORMAT_VERSION, type Vehicle } from '../schema/vehicle.js';

/** Tallowmere's current Formula-Student-class car, with driver: pushrods, bars both ends, deliberate rear roll understeer. */
const tur26Ember: Vehicle = {
  formatVersion: VEHICLE_FORMAT_VERSION,
  name: 'TUR-26 Ember',
  massKg: 292,
  wheelbaseMm: 1550,
  cgToFrontAxleMm: 820,
  cgHeightMm: 290,
  yawInertiaKgM2: 110,
  rollInertiaKgM2: 18,
  rollDampingNmsPerDeg: 9,
  steeringRatio: 4.6,
  options: { rollGravityTerm: true },
  front: {
    trackMm: 1220,
    rollCentreHeightMm: 40,
    unsprungMassKg: 24,
    unsprungCgHeightMm: 228,
    tyre: { loadSensitivity: { a: 1.0, b: 0.00022 }, camberStiffnessNPerDeg: 28, verticalRateNPerMm: 105, pneumaticTrailMm: 14 },
    spring: { rateNPerMm: 35, motionRatio: 0.9 },
    antiRollBar: { rollRateNmPerDeg: 240 },
    rollSteerCoefficient: 0,
    rollCamberDegPerDeg: 0.35,
    complianceSteerDegPerKN: 0.06,
    steeringStiffnessNmPerDeg: 120,
  },
  rear: {
    trackMm: 1180,
    rollCentreHeightMm: 60,
    unsprungMassKg: 26,
    unsprungCgHeightMm: 228,
    tyre: { loadSensitivity: { a: 1.0, b: 0.00022 }, camberStiffnessNPerDeg: 28, verticalRateNPerMm: 105, pneumaticTrailMm: 14 },
    spring: { rateNPerMm: 40, motionRatio: 0.9 },
    antiRollBar: { rollRateNmPerDeg: 150 },
    rollSteerCoefficient: -0.06,
    rollCamberDegPerDeg: 0.4,
    complianceSteerDegPerKN: -0.05,
  },
};

/** Last year's car: heavier, tube rear bar entered by geometry, no deliberate roll steer. */
const tur25Cinder: Vehicle = {
  formatVersion: VEHICLE_FORMAT_VERSION,
  name: 'TUR-25 Cinder',
  massKg: 306,
  wheelbaseMm: 1560,
  cgToFrontAxleMm: 810,
  cgHeightMm: 300,
  yawInertiaKgM2: 118,
  rollInertiaKgM2: 19,
  rollDampingNmsPerDeg: 8,
  steeringRatio: 4.8,
  options: { rollGravityTerm: true },
  front: {
    trackMm: 1230,
    rollCentreHeightMm: 35,
    unsprungMassKg: 25,
    unsprungCgHeightMm: 230,
    tyre: { corneringStiffnessNPerDeg: 560, camberStiffnessNPerDeg: 26, verticalRateNPerMm: 100, pneumaticTrailMm: 15 },
    spring: { rateNPerMm: 30, motionRatio: 0.95 },
    antiRollBar: { outerDiameterMm: 16, innerDiameterMm: 12, activeLengthMm: 380, leverLengthMm: 70, linkMotionRatio: 0.6 },
    rollSteerCoefficient: 0.01,
    rollCamberDegPerDeg: 0.3,
    complianceSteerDegPerKN: 0.07,
    steeringStiffnessNmPerDeg: 110,
  },
  rear: {
    trackMm: 1190,
    rollCentreHeightMm: 55,
    unsprungMassKg: 27,
    unsprungCgHeightMm: 230,
    tyre: { corneringStiffnessNPerDeg: 590, camberStiffnessNPerDeg: 26, verticalRateNPerMm: 100, pneumaticTrailMm: 15 },
    spring: { rateNPerMm: 35, motionRatio: 0.95 },
    antiRollBar: { outerDiameterMm: 14, innerDiameterMm: 11, activeLengthMm: 360, leverLengthMm: 65, linkMotionRatio: 0.6, shearModulusGPa: 79.3 },
    rollSteerCoefficient: 0,
    rollCamberDegPerDeg: 0.35,
    complianceSteerDegPerKN: -0.04,
  },
};

/** Brackenfield's road hatchback: struts in front, twist-free five-link rear, front-heavy. */
const brackenfieldB3: Vehicle = {
  formatVersion: VEHICLE_FORMAT_VERSION,
  name: 'Brackenfield B3 hatchback',
  massKg: 1310,
  wheelbaseMm: 2560,
  cgToFrontAxleMm: 1000,
  cgHeightMm: 540,
  yawInertiaKgM2: 1950,
  rollInertiaKgM2: 420,
  rollDampingNmsPerDeg: 60,
  steeringRatio: 15.2,
  options: { rollGravityTerm: true },
  front: {
    trackMm: 1525,
    rollCentreHeightMm: 65,
    unsprungMassKg: 88,
    unsprungCgHeightMm: 305,
    tyre: { loadSensitivity: { a: 0.38, b: 0.000025 }, camberStiffnessNPerDeg: 20, verticalRateNPerMm: 220, pneumaticTrailMm: 30 },
    spring: { rateNPerMm: 28, motionRatio: 0.95 },
    antiRollBar: { rollRateNmPerDeg: 480 },
    rollSteerCoefficient: 0.06,
    rollCamberDegPerDeg: 0.75,
    complianceSteerDegPerKN: 0.04,
    steeringStiffnessNmPerDeg: 1400,
  },
  rear: {
    trackMm: 1505,
    rollCentreHeightMm: 105,
    unsprungMassKg: 76,
    unsprungCgHeightMm: 305,
    tyre: { loadSensitivity: { a: 0.38, b: 0.000025 }, camberStiffnessNPerDeg: 20, verticalRateNPerMm: 220, pneumaticTrailMm: 30 },
    spring: { rateNPerMm: 25, motionRatio: 0.8 },
    antiRollBar: { rollRateNmPerDeg: 200 },
    rollSteerCoefficient: -0.03,
    rollCamberDegPerDeg: 0.7,
    complianceSteerDegPerKN: -0.02,
  },
};

/** The estate on the same platform: longer, heavier at the rear, stiffer rear springs. */
const brackenfieldB5: Vehicle = {
  formatVersion: VEHICLE_FORMAT_VERSION,
  name: 'Brackenfield B5 estate',
  massKg: 1475,
  wheelbaseMm: 2690,
  cgToFrontAxleMm: 1160,
  cgHeightMm: 565,
  yawInertiaKgM2: 2400,
  rollInertiaKgM2: 500,
  rollDampingNmsPerDeg: 65,
  steeringRatio: 15.2,
  options: { rollGravityTerm: true },
  front: {
    trackMm: 1530,
    rollCentreHeightMm: 60,
    unsprungMassKg: 90,
    unsprungCgHeightMm: 310,
    tyre: { loadSensitivity: { a: 0.37, b: 0.000023 }, camberStiffnessNPerDeg: 20, verticalRateNPerMm: 230, pneumaticTrailMm: 30 },
    spring: { rateNPerMm: 30, motionRatio: 0.95 },
    antiRollBar: { rollRateNmPerDeg: 520 },
    rollSteerCoefficient: 0.06,
    rollCamberDegPerDeg: 0.75,
    complianceSteerDegPerKN: 0.04,
    steeringStiffnessNmPerDeg: 1400,
  },
  rear: {
    trackMm: 1520,
    rollCentreHeightMm: 110,
    unsprungMassKg: 80,
    unsprungCgHeightMm: 310,
    tyre: { loadSensitivity: { a: 0.37, b: 0.000023 }, camberStiffnessNPerDeg: 20, verticalRateNPerMm: 230, pneumaticTrailMm: 30 },
    spring: { rateNPerMm: 34, motionRatio: 0.8 },
    antiRollBar: { rollRateNmPerDeg: 180 },
    rollSteerCoefficient: -0.04,
    rollCamberDegPerDeg: 0.7,
    complianceSteerDegPerKN: -0.02,
  },
};

export const exampleVehicles = { tur26Ember, tur25Cinder, brackenfieldB3, brackenfieldB5 } as const satisfies Record<string, Vehicle>;
export type ExampleVehicleName = keyof typeof exampleVehicles;
