// The demo laboratory's large mechanism: methane burning slowly in a hot-wall reactor, about sixty
// steps with temperature-dependent coefficients and element balance on, so that every screen meets a
// realistic size. Written for the demo from general chemistry; every number is invented for the demo,
// not from a source.
export const methaneOxidation = {
  title: "Methane oxidation in the hot-wall reactor",
  summary: "Sixty balanced steps of slow methane burning; the coefficients depend on the temperature T.",
  source: `# Methane burning slowly in the hot-wall reactor at temperature T (kelvin).
# Every coefficient is invented for the demo, not from a source: Arrhenius-type expressions of T
# written from general chemistry. Concentrations in mol/L, time in seconds; M is the bath gas.
balanced
T = 1100
fixed [M] = 1.0e-2
[CH4]0 = 2.0e-4
[O2]0 = 4.0e-4

# hydrogen and oxygen chains
h1: H + O2 <=> O + OH @ 1.2e11 * exp(-8400 / T), 1.6e10 / T^0.3
h2: O + H2 <=> H + OH @ 2.5e4 * T^1.6 * exp(-3900 / T), 1.1e4 * T^1.6 * exp(-3300 / T)
h3: OH + H2 <=> H + H2O @ 1.1e5 * T^1.5 * exp(-1800 / T), 4.6e5 * T^1.5 * exp(-9300 / T)
h4: 2OH <=> O + H2O @ 2.0e3 * T^1.1 * exp(50 / T), 2.2e3 * T^1.1 * exp(-8700 / T)
h5: H2 + M <=> 2H + M @ 3.0e15 / T * exp(-52000 / T), 5.0e11 / T
h6: O2 + M <=> 2O + M @ 1.5e15 / T * exp(-59000 / T), 4.0e9 / T^0.5
h7: OH + M <=> O + H + M @ 2.0e14 / T * exp(-51000 / T), 3.0e11 / T
h8: H2O + M <=> H + OH + M @ 8.0e15 / T^1.2 * exp(-60000 / T), 1.4e13 / T^1.2
h9: H + O2 + M <=> HO2 + M @ 4.5e11 / T^0.8, 6.0e13 / T^0.8 * exp(-24500 / T)
h10: HO2 + H -> H2 + O2 @ 1.7e10 * exp(-400 / T)
h11: HO2 + H -> 2OH @ 4.0e10 * exp(-300 / T)
h12: HO2 + O -> OH + O2 @ 2.0e10
h13: HO2 + OH -> H2O + O2 @ 2.9e10 * exp(250 / T)
h14: 2HO2 -> H2O2 + O2 @ 1.3e8 * exp(800 / T)
h15: H2O2 + M <=> 2OH + M @ 1.2e14 * exp(-22000 / T), 8.0e9
h16: H2O2 + H -> H2O + OH @ 1.0e10 * exp(-1800 / T)
h17: H2O2 + H -> HO2 + H2 @ 2.0e10 * exp(-4000 / T)
h18: H2O2 + O -> OH + HO2 @ 9.5e3 * T^2 * exp(-2000 / T)
h19: H2O2 + OH -> H2O + HO2 @ 1.0e9 * exp(-200 / T)

# carbon monoxide and formyl
c1: CO + O + M -> CO2 + M @ 1.5e9 * exp(-1500 / T)
c2: CO + OH <=> CO2 + H @ 4.4e3 * T^1.5 * exp(370 / T), 1.6e7 * T^1.2 * exp(-12500 / T)
c3: CO + HO2 -> CO2 + OH @ 1.5e11 * exp(-11900 / T)
c4: CO + O2 -> CO2 + O @ 2.5e9 * exp(-24000 / T)
c5: HCO + M <=> H + CO + M @ 1.9e14 / T * exp(-8500 / T), 2.0e10 / T^0.2
c6: HCO + O2 -> CO + HO2 @ 7.5e9 * exp(200 / T)
c7: HCO + H -> CO + H2 @ 7.0e10
c8: HCO + OH -> CO + H2O @ 5.0e10
c9: HCO + O -> CO2 + H @ 3.0e10

# formaldehyde
f1: CH2O + H -> HCO + H2 @ 5.7e4 * T^1.5 * exp(-1300 / T)
f2: CH2O + OH -> HCO + H2O @ 3.4e6 * T^0.9 * exp(300 / T)
f3: CH2O + O -> HCO + OH @ 2.0e10 * exp(-1600 / T)
f4: CH2O + O2 -> HCO + HO2 @ 6.0e10 * exp(-20000 / T)
f5: CH2O + M -> HCO + H + M @ 3.0e13 * exp(-37000 / T)
f6: CH2O + HO2 -> HCO + H2O2 @ 4.0e9 * exp(-6000 / T)

# methane and methyl
m1: CH4 + M <=> CH3 + H + M @ 2.2e14 * exp(-46000 / T), 3.0e10 / T^0.4
m2: CH4 + H <=> CH3 + H2 @ 1.3e1 * T^3 * exp(-4050 / T), 6.6e-1 * T^3 * exp(-3850 / T)
m3: CH4 + OH <=> CH3 + H2O @ 1.6e4 * T^1.8 * exp(-1400 / T), 2.0e3 * T^1.8 * exp(-7500 / T)
m4: CH4 + O -> CH3 + OH @ 7.2e5 * T^1.5 * exp(-4300 / T)
m5: CH4 + O2 -> CH3 + HO2 @ 4.0e10 * exp(-28500 / T)
m6: CH4 + HO2 -> CH3 + H2O2 @ 1.1e10 * exp(-11500 / T)
m7: CH3 + O2 -> CH3O + O @ 1.3e10 * exp(-15400 / T)
m8: CH3 + O2 -> CH2O + OH @ 3.0e8 * exp(-5800 / T)
m9: CH3 + O -> CH2O + H @ 5.0e10
m10: CH3 + OH -> CH2O + H2 @ 4.0e9 * exp(-2500 / T)
m11: CH3 + HO2 -> CH3O + OH @ 1.8e10
m12: 2CH3 + M -> C2H6 + M @ 2.4e12 / T^0.6

# methoxy, hydroxymethyl and methanol
x1: CH3O + M -> CH2O + H + M @ 5.0e12 * exp(-11000 / T)
x2: CH3O + O2 -> CH2O + HO2 @ 2.5e7 * exp(-900 / T)
x3: CH3 + OH + M -> CH3OH + M @ 1.1e12 / T^0.5
x4: CH3OH + OH -> CH2OH + H2O @ 8.0e4 * T^1.4 * exp(-60 / T)
x5: CH2OH + O2 -> CH2O + HO2 @ 1.5e10 * exp(-900 / T)
x6: CH2OH + M -> CH2O + H + M @ 1.0e13 * exp(-14500 / T)

# ethane and ethylene
e1: C2H6 + H -> C2H5 + H2 @ 1.4e5 * T^1.5 * exp(-3700 / T)
e2: C2H6 + OH -> C2H5 + H2O @ 7.2e3 * T^2 * exp(-430 / T)
e3: C2H6 + CH3 -> C2H5 + CH4 @ 5.5e-4 * T^4 * exp(-4200 / T)
e4: C2H5 + M -> C2H4 + H + M @ 1.0e14 * exp(-16800 / T)
e5: C2H5 + O2 -> C2H4 + HO2 @ 8.4e8 * exp(-1950 / T)
e6: C2H4 + OH -> C2H3 + H2O @ 3.6e3 * T^2 * exp(-1250 / T)
e7: C2H3 + O2 -> CH2O + HCO @ 4.0e9 * exp(125 / T)
e8: C2H4 + O -> CH3 + HCO @ 1.2e4 * T^1.8 * exp(-110 / T)
`,
};
