/**
 * Published sources the demo items cite. Each item names one. Where a detail (edition, year,
 * pages) is recalled rather than checked against the source, the comment says "from memory".
 */
export const REF = {
  // Cited with these details in shared/TESTING.md ("Classification and vocabulary").
  taxonomy2014: "Chatburn RL, El-Khatib M, Mireles-Cabodevila E. A taxonomy for mechanical ventilation: 10 fundamental maxims. Respir Care. 2014;59(11):1747–63.",
  // Cited with these details in shared/TESTING.md.
  classification2007: "Chatburn RL. Classification of ventilator modes: update and proposal for implementation. Respir Care. 2007;52(3):301–23.",
  // Cited in shared/TESTING.md (scope of the vocabulary standard).
  iso19223: "ISO 19223:2019. Lung ventilators and related equipment — Vocabulary and semantics. International Organization for Standardization; 2019.",
  // Journal, year and the finding (cannot tell effort from compliance) are in shared/TESTING.md; the title and pages are from memory.
  adaptive2007: "Branson RD, Chatburn RL. Should adaptive pressure control modes be utilized for virtually all patients receiving mechanical ventilation? Respir Care. 2007;52(4):478–85.",
  // From memory: volume, pages.
  targeting2011: "Chatburn RL, Mireles-Cabodevila E. Closed-loop control of mechanical ventilation: description and classification of targeting schemes. Respir Care. 2011;56(1):85–102.",
  // Cited with these details in shared/TESTING.md (mean airway pressure).
  mawp1992: "Marini JJ, Ravenscraft SA. Mean airway pressure: physiologic determinants and clinical importance. Crit Care Med. 1992;20(11):1604–16.",
  // From memory: issue and pages.
  drivingPressure2015: "Amato MBP, Meade MO, Slutsky AS, et al. Driving pressure and survival in the acute respiratory distress syndrome. N Engl J Med. 2015;372(8):747–55.",
  // From memory: issue and pages.
  asynchrony2006: "Thille AW, Rodriguez P, Cabello B, Lellouche F, Brochard L. Patient-ventilator asynchrony during assisted mechanical ventilation. Intensive Care Med. 2006;32(10):1515–22.",
  // From memory: issue and pages.
  waveforms2006: "Georgopoulos D, Prinianakis G, Kondili E. Bedside waveforms interpretation as a tool to identify patient-ventilator asynchronies. Intensive Care Med. 2006;32(1):34–47.",
  // From memory: issue and pages.
  autoPeep1982: "Pepe PE, Marini JJ. Occult positive end-expiratory pressure in mechanically ventilated patients with airflow obstruction: the auto-PEEP effect. Am Rev Respir Dis. 1982;126(1):166–70.",
  // From memory: issue and pages.
  pressureSupport2005: "Hess DR. Ventilator waveforms and the physiology of pressure support ventilation. Respir Care. 2005;50(2):166–86.",
  // From memory: edition and year.
  hessKacmarek: "Hess DR, Kacmarek RM. Essentials of Mechanical Ventilation. 4th ed. New York: McGraw-Hill Education; 2019.",
  // From memory: edition and year.
  pilbeam: "Cairo JM. Pilbeam's Mechanical Ventilation: Physiological and Clinical Applications. 7th ed. St Louis: Elsevier; 2020.",
  // From memory: edition and year.
  egan: "Kacmarek RM, Stoller JK, Heuer AJ, eds. Egan's Fundamentals of Respiratory Care. 12th ed. St Louis: Elsevier; 2020.",
  // Cited in shared/TESTING.md (V13, V17).
  timeConstants: "Yartsev A. Time constants. Deranged Physiology (online textbook of critical care physiology).",
  // Cited in shared/TESTING.md ("Classification and vocabulary").
  limitVariables: "Yartsev A. Limit variables in mechanical ventilation. Deranged Physiology; 2015.",
  // From memory: issue and pages.
  asynchronyMortality2015: "Blanch L, Villagra A, Sales B, et al. Asynchronies during mechanical ventilation are associated with mortality. Intensive Care Med. 2015;41(4):633–41.",
} as const;
