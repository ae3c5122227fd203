/**
 * Demo items on lung-mechanics calculations. Every key is worked from the formula in the
 * rationale and checked in seeds/bank/bank.test.ts against the bench's calculation functions;
 * several inputs are the published check values of shared/TESTING.md (V-numbers beside them).
 */
import { numeric, single, type DemoItem } from "./builders";
import { REF } from "./references";

export const MECHANICS_ITEMS: DemoItem[] = [
  // TESTING.md V10 (driving-pressure review, Table 1, PMC7449829).
  numeric(
    "calc-cstat-1",
    ["lung-mechanics"],
    "Volume control with an inspiratory hold: tidal volume 500 mL, plateau pressure 20 cmH2O, PEEP 5 cmH2O. What is the static compliance? Give one decimal.",
    { value: 33.3, unit: "mL/cmH2O", tolerance: 0.1, decimals: 1 },
    "Static compliance = Vt / (Pplat − PEEP) = 500 / (20 − 5) = 33.3 mL/cmH2O. Peak pressure is not used: it includes the resistive pressure.",
    REF.hessKacmarek,
  ),
  // TESTING.md V9 (OpenAnesthesia, "Peak vs. plateau airway pressure").
  numeric(
    "calc-cstat-2",
    ["lung-mechanics"],
    "Tidal volume 360 mL, plateau pressure 28 cmH2O, PEEP 8 cmH2O. What is the static compliance?",
    { value: 18, unit: "mL/cmH2O", tolerance: 0.5, decimals: 0 },
    "Cstat = Vt / (Pplat − PEEP) = 360 / (28 − 8) = 18 mL/cmH2O: a stiff respiratory system, as in ARDS.",
    REF.hessKacmarek,
  ),
  // TESTING.md V9: the same inputs give a driving pressure of 20.
  numeric(
    "calc-driving-1",
    ["lung-mechanics"],
    "Plateau pressure 28 cmH2O, PEEP 8 cmH2O. What is the driving pressure?",
    { value: 20, unit: "cmH2O", tolerance: 0, decimals: 0 },
    "Driving pressure = Pplat − PEEP = 28 − 8 = 20 cmH2O; it equals Vt divided by respiratory-system compliance.",
    REF.drivingPressure2015,
  ),
  numeric(
    "calc-driving-2",
    ["lung-mechanics"],
    "Tidal volume 420 mL in a patient whose static compliance is 30 mL/cmH2O. What is the driving pressure?",
    { value: 14, unit: "cmH2O", tolerance: 0, decimals: 0 },
    "ΔP = Vt / Crs = 420 / 30 = 14 cmH2O, the same as Pplat − PEEP.",
    REF.drivingPressure2015,
  ),
  // TESTING.md V8: recomputed from a practice sheet's inputs; flow 40 L/min = 0.667 L/s, not rounded.
  numeric(
    "calc-raw-1",
    ["lung-mechanics"],
    "Volume control, constant flow 40 L/min, with a pause: PIP 20 cmH2O, plateau 15 cmH2O. What is the airway resistance? Give one decimal.",
    { value: 7.5, unit: "cmH2O/(L/s)", tolerance: 0.1, decimals: 1 },
    "Raw = (PIP − Pplat) / flow in L/s = (20 − 15) / (40/60) = 7.5 cmH2O/(L/s). Rounding the flow to 0.7 L/s first would give 7.1 — keep the exact conversion.",
    REF.hessKacmarek,
  ),
  // TESTING.md V7 (RNSH ICU education, "Resistance").
  numeric(
    "calc-raw-2",
    ["lung-mechanics"],
    "The resistive pressure (peak minus plateau) is 4.5 cmH2O at a constant flow of 20 L/min. What is the resistance? Give one decimal.",
    { value: 13.5, unit: "cmH2O/(L/s)", tolerance: 0.1, decimals: 1 },
    "R = 4.5 / (20/60) = 4.5 / 0.333 = 13.5 cmH2O/(L/s).",
    REF.hessKacmarek,
  ),
  // TESTING.md V12.
  numeric(
    "calc-tau-1",
    ["lung-mechanics"],
    "Resistance 5 cmH2O/(L/s), compliance 60 mL/cmH2O. What is the time constant? Give two decimals.",
    { value: 0.3, unit: "s", tolerance: 0.01, decimals: 2 },
    "τ = R × C = 5 cmH2O/(L/s) × 0.060 L/cmH2O = 0.30 s. Convert compliance to L/cmH2O so the units cancel to seconds.",
    REF.timeConstants,
  ),
  // TESTING.md V13: 1 − e^(−3) = 95.02 %.
  numeric(
    "calc-tau-percent",
    ["lung-mechanics"],
    "In a passive single-compartment lung, what percentage of the tidal volume has been exhaled after three time constants? Give one decimal.",
    { value: 95.0, unit: "%", tolerance: 0.1, decimals: 1 },
    "Exhaled fraction = 1 − e^(−n); after 3 τ it is 1 − e^(−3) = 95.0 %. (After 1 τ 63.2 %, 5 τ 99.3 %; some pages print 96 % or 100 % — both wrong.)",
    REF.timeConstants,
  ),
  numeric(
    "calc-tau-expiry",
    ["lung-mechanics", "patient-ventilator-asynchrony"],
    "Resistance 20 cmH2O/(L/s), compliance 50 mL/cmH2O. About how long does the lung need to exhale 95 % of the breath (three time constants)? Give one decimal.",
    { value: 3.0, unit: "s", tolerance: 0.1, decimals: 1 },
    "τ = 20 × 0.050 = 1.0 s; three time constants = 3.0 s. If the expiratory time is shorter, gas is trapped.",
    REF.timeConstants,
  ),
  numeric(
    "calc-cdyn",
    ["lung-mechanics"],
    "Tidal volume 450 mL, peak inspiratory pressure 30 cmH2O, PEEP 5 cmH2O. What is the dynamic compliance?",
    { value: 18, unit: "mL/cmH2O", tolerance: 0.5, decimals: 0 },
    "Dynamic compliance = Vt / (PIP − PEEP) = 450 / 25 = 18 mL/cmH2O. It includes the resistive pressure, so it is lower than static compliance; label the two differently.",
    REF.pilbeam,
  ),
  // TESTING.md V3.
  numeric(
    "calc-ti",
    ["lung-mechanics", "modes"],
    "Volume control, tidal volume 500 mL at a constant flow of 60 L/min, no pause. What is the inspiratory time? Give one decimal.",
    { value: 0.5, unit: "s", tolerance: 0.05, decimals: 1 },
    "Ti = Vt / flow = 0.5 L / (60/60 L/s) = 0.5 s.",
    REF.egan,
  ),
  // TESTING.md V14.
  numeric(
    "calc-mawp-pc",
    ["lung-mechanics", "modes"],
    "Pressure control (a rectangular pressure waveform): PIP 25 cmH2O, PEEP 5 cmH2O, inspiratory time 1 s, rate 20 breaths/min. What is the mean airway pressure? Give one decimal.",
    { value: 11.7, unit: "cmH2O", tolerance: 0.1, decimals: 1 },
    "Total cycle = 60/20 = 3 s. Mean airway pressure = (PIP − PEEP) × Ti/Ttot + PEEP = 20 × 1/3 + 5 = 11.7 cmH2O.",
    REF.mawp1992,
  ),
  // TESTING.md V15.
  numeric(
    "calc-mawp-vc",
    ["lung-mechanics", "modes"],
    "Volume control at constant flow (a triangular pressure waveform, shape factor 0.5): PIP 25 cmH2O, PEEP 5 cmH2O, Ti 1 s, rate 20. What is the mean airway pressure? Give one decimal.",
    { value: 8.3, unit: "cmH2O", tolerance: 0.1, decimals: 1 },
    "Mean airway pressure = 0.5 × (PIP − PEEP) × Ti/Ttot + PEEP = 0.5 × 20 × 1/3 + 5 = 8.3 cmH2O.",
    REF.mawp1992,
  ),
  // TESTING.md V5.
  numeric(
    "calc-ve",
    ["lung-mechanics"],
    "Tidal volume 500 mL, rate 15 breaths/min. What is the minute ventilation? Give one decimal.",
    { value: 7.5, unit: "L/min", tolerance: 0.05, decimals: 1 },
    "Minute ventilation = Vt × f = 0.5 L × 15 = 7.5 L/min.",
    REF.egan,
  ),
  // TESTING.md V6.
  numeric(
    "calc-va",
    ["lung-mechanics"],
    "Tidal volume 500 mL, rate 12 breaths/min, dead space 150 mL. What is the alveolar ventilation? Give one decimal.",
    { value: 4.2, unit: "L/min", tolerance: 0.05, decimals: 1 },
    "Alveolar ventilation = (Vt − VD) × f = (0.5 − 0.15) × 12 = 4.2 L/min.",
    REF.egan,
  ),
  // TESTING.md V4.
  numeric(
    "calc-te",
    ["lung-mechanics", "modes"],
    "Rate 12 breaths/min, inspiratory time 1.0 s. What is the expiratory time? Give one decimal.",
    { value: 4.0, unit: "s", tolerance: 0.05, decimals: 1 },
    "Total cycle = 60/12 = 5 s; Te = 5 − 1 = 4.0 s; the I:E ratio is 1:4.",
    REF.egan,
  ),
  // TESTING.md V11.
  numeric(
    "calc-pip-eom",
    ["lung-mechanics", "modes"],
    "Volume control, constant flow 1 L/s, tidal volume 0.5 L, compliance 60 mL/cmH2O, resistance 5 cmH2O/(L/s), PEEP 5 cmH2O, passive patient. What is the peak inspiratory pressure? Give one decimal.",
    { value: 18.3, unit: "cmH2O", tolerance: 0.1, decimals: 1 },
    "Equation of motion at end-inspiration: PIP = PEEP + V/C + R × flow = 5 + 500/60 + 5 × 1 = 5 + 8.33 + 5 = 18.3 cmH2O. The plateau (flow zero) would be 13.3 cmH2O.",
    REF.taxonomy2014,
  ),
  // TESTING.md V10: elastance 0.030 cmH2O/mL.
  numeric(
    "calc-elastance",
    ["lung-mechanics"],
    "Tidal volume 500 mL, plateau 20 cmH2O, PEEP 5 cmH2O. What is the elastance? Give three decimals.",
    { value: 0.03, unit: "cmH2O/mL", tolerance: 0.001, decimals: 3 },
    "Elastance is the inverse of compliance: (Pplat − PEEP) / Vt = 15 / 500 = 0.030 cmH2O/mL.",
    REF.taxonomy2014,
  ),
  // TESTING.md V17: Vt = C·ΔP·(1 − e^(−Ti/τ)).
  numeric(
    "calc-pc-volume",
    ["lung-mechanics", "modes"],
    "Pressure control, passive patient: 15 cmH2O above PEEP for 1.0 s, compliance 50 mL/cmH2O, resistance 10 cmH2O/(L/s). What tidal volume is delivered? Give a whole number.",
    { value: 648, unit: "mL", tolerance: 5, decimals: 0 },
    "τ = 10 × 0.050 = 0.5 s; Vt = C × ΔP × (1 − e^(−Ti/τ)) = 50 × 15 × (1 − e^(−2)) = 750 × 0.865 = 648 mL.",
    REF.timeConstants,
  ),
  single(
    "calc-which-compliance",
    ["lung-mechanics"],
    "Which pressure belongs in the denominator of static compliance?",
    ["Plateau pressure minus PEEP", "Peak pressure minus PEEP", "Peak pressure minus plateau pressure", "Mean airway pressure"],
    0,
    "Static compliance uses the pressure at zero flow (plateau), so the resistive pressure is excluded; peak minus PEEP gives dynamic compliance; peak minus plateau is the resistive pressure.",
    REF.hessKacmarek,
  ),
];
