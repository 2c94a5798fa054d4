/**
 * Citations shown in the UI's basis view, one per published method. Each
 * formula names its source here and where it is implemented.
 */
export const SOURCES = {
  alveolarGas:
    "Alveolar gas equation (Fenn WO, Rahn H, Otis AB. Am J Physiol 1946;146:637–53), simplified clinical form",
  severinghaus:
    "Severinghaus JW. Simple, accurate equations for human blood O2 dissociation computations. J Appl Physiol 1979;46:599–602",
  ellis: "Ellis RK. Determination of PO2 from saturation. J Appl Physiol 1989;67:902",
  oxygenContent:
    "Oxygen content equation, standard physiology texts (e.g. Nunn's Applied Respiratory Physiology): 1.34 mL O2/g Hb, 0.003 mL O2/dL/mmHg",
  oxygenDelivery: "DO2 = 10 × cardiac output × CaO2 (common practice)",
  pfRatio:
    "Horovitz JH, Carrico CJ, Shires GT. Pulmonary response to major injury. Arch Surg 1974;108:349–55",
  sfRatio:
    "Rice TW, Wheeler AP, Bernard GR, et al. Comparison of the SpO2/FIO2 ratio and the PaO2/FIO2 ratio in patients with acute lung injury or ARDS. Chest 2007;132:410–7",
  rox: "Roca O, et al. J Crit Care 2016;35:200–5; Roca O, et al. Am J Respir Crit Care Med 2019;199:1368–76",
  oxygenationIndex:
    "Pediatric Acute Lung Injury Consensus Conference Group. Pediatr Crit Care Med 2015;16:428–39 (OI = FiO2 % × MAP / PaO2)",
  oxygenSaturationIndex:
    "Thomas NJ, et al. Pediatr Crit Care Med 2010;11:12–7; PALICC, Pediatr Crit Care Med 2015;16:428–39 (OSI = FiO2 % × MAP / SpO2)",
  alveolarArterial: "A–a gradient and a/A ratio from the alveolar gas equation (common practice)",
  arterialAlveolarRatio:
    "Gilbert R, Keighley JF. The arterial/alveolar oxygen tension ratio. Am Rev Respir Dis 1974;109:142–5",
  expectedAaGradient:
    "Expected A–a gradient on room air ≈ age/4 + 4 mmHg (bedside rule of thumb, common practice)",
  shunt:
    "Shunt equation (Berggren SM. Acta Physiol Scand 1942;4 Suppl 11) with an assumed arterio-venous O2 content difference",
  predictedBodyWeight:
    "ARDS Network. Ventilation with lower tidal volumes as compared with traditional tidal volumes for acute lung injury and ARDS. N Engl J Med 2000;342:1301–8",
  drivingPressure:
    "Amato MBP, et al. Driving pressure and survival in ARDS. N Engl J Med 2015;372:747–55",
  staticCompliance:
    "Static compliance = VT / (Pplat − PEEP) (respiratory mechanics, common practice)",
  mechanicalPower:
    "Gattinoni L, et al. Ventilator-related causes of lung injury: the mechanical power. Intensive Care Med 2016;42:1567–75 (simplified equation for volume-controlled ventilation)",
  ventilatoryRatio:
    "Sinha P, Fauvel NJ, Singh S, Soni N. Ventilatory ratio: a simple bedside measure of ventilation. Br J Anaesth 2009;102:692–7 (VE predicted 100 mL/kg/min of PBW, PaCO2 ideal 5 kPa); in mmHg, VR = VE × PaCO2 / (PBW × 100 × 37.5): Sinha P, Calfee CS, Beitler JR, et al. Physiologic analysis and clinical performance of the ventilatory ratio in ARDS. Am J Respir Crit Care Med 2019;199:333–41 (volume and pages recalled from memory)",
  rapidShallowBreathingIndex:
    "Yang KL, Tobin MJ. A prospective study of indexes predicting the outcome of trials of weaning from mechanical ventilation. N Engl J Med 1991;324:1445–50 (f/VT; threshold 105 breaths/min/L)",
  linearPfImputation:
    "Rice TW, Wheeler AP, Bernard GR, et al. Comparison of the SpO2/FIO2 ratio and the PaO2/FIO2 ratio in patients with acute lung injury or ARDS. Chest 2007;132:410–7 (S/F = 64 + 0.84 × P/F, from SpO2 ≤ 97 %)",
  nonlinearPfImputation:
    "Brown SM, Grissom CK, Moss M, et al. Nonlinear imputation of PaO2/FIO2 from SpO2/FIO2 among patients with acute respiratory distress syndrome. Chest 2016;150:307–13 (PaO2 from SpO2 ≤ 96 % on the Severinghaus curve by Ellis's inverse)",
  weaningReadiness:
    "Boles JM, et al. Weaning from mechanical ventilation. Eur Respir J 2007;29:1033–56 (Table 5, considerations for assessing readiness to wean)",
  weaningFio2:
    "MacIntyre NR, et al. Evidence-based guidelines for weaning and discontinuing ventilatory support. Chest 2001;120(6 Suppl):375S–95S (FiO2 ≤ 0.4–0.5; the range recalled from memory)",
  oxygenCylinder:
    "Cylinder duration = (gauge pressure − reserve) × cylinder factor ÷ flow, or water capacity × pressure in bar ÷ flow, ideal gas (common practice; the US cylinder factors and the 200 psi reserve are common practice, not from one source)",
  icaoAtmosphere: "ICAO Doc 7488/3, Manual of the ICAO Standard Atmosphere, 3rd ed. 1993",
  berlin:
    "ARDS Definition Task Force (Ranieri VM, et al.). Acute respiratory distress syndrome: the Berlin Definition. JAMA 2012;307:2526–33",
  globalDefinition:
    "Matthay MA, et al. A new global definition of acute respiratory distress syndrome. Am J Respir Crit Care Med 2024;209:37–47",
  ardsNetworkLowerPeep: "ARDS Network. N Engl J Med 2000;342:1301–8 (lower PEEP/higher FiO2 table)",
  ardsNetworkHigherPeep:
    "Brower RG, et al. Higher versus lower positive end-expiratory pressures in patients with ARDS (ALVEOLI). N Engl J Med 2004;351:327–36 (higher PEEP/lower FiO2 table)",
} as const;
