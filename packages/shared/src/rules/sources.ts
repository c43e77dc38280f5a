// Source labels carried on every reason. Status words follow the reference notes:
// "secondary copy" = found only in a summary or copy, not the publisher's own text;
// "common practice, no source"; "from memory" = recalled, not confirmed.
export const SOURCES = {
  en280: 'BS EN 280:2001+A2:2009 MEWP rated wind speed 12.5 m/s (secondary copy: IPAF FAQ)',
  pasmaTower: 'PASMA FAQ for EN 1004 towers: stop and dismantle at an average of 17 mph (pasma.co.uk/faqs/safety)',
  hseRoofBalance: 'HSE construction FAQ, roof work: winds over 23 mph (force 5) affect balance (secondary copy)',
  scaffoldEdgeBalance: 'Common practice, no source: the HSE roof-work figure (winds over 23 mph, force 5, affect balance) applied to scaffold and roof edges; HSE gives it for roof work only',
  nfrcRoof: 'NFRC "Roofing and cladding in windy conditions": slates, tiles, felt stop at mean 23 mph or gusts 35 mph (secondary copy)',
  nfrcSheets: 'NFRC "Roofing and cladding in windy conditions": sheets over 5 m stop at mean 17 mph or gusts 26 mph (secondary copy)',
  scaffoldUse: 'Scaffold designer guidance: usual maximum 18 m/s for using a scaffold (weak secondary copy); no NASC/TG20 figure found',
  scaffoldErection: 'Common practice, no source: HSE 23 mph balance figure and NFRC 35 mph gust applied to handling tube and boards; no NASC/TG20 figure found',
  wahrReg4: 'Work at Height Regulations 2005 reg 4(3) and 29 CFR 1926.451(f)(12) name no wind speed',
  nbsF10: 'NBS specification clause F10/185 "Adverse weather" (secondary copy); NHBC Standards 2023 §3.2.5',
  nbsF10Lime: 'NBS specification clause F10/185, hydraulic lime mortar (secondary copy)',
  nhbcFrost: 'NHBC Standards 2023 §3.2.5: frost protection may be needed for up to six days',
  nhbcHeat: 'NHBC Standards 2022 §6.1.20: hot weather above 30 °C',
  tms602Cold: 'TMS 602 / ACI 530.1 cold-weather construction, ACI 530.1-02 table (secondary copy: Masonry Magazine Sept 2004); preparation of units and iced surfaces (secondary copies: masoncontractors.org cold-weather construction, masonryconstruction.com)',
  tms602Protection: 'TMS 602 / ACI 530.1 cold-weather protection by mean daily temperature (secondary copy; below 20 °F row from memory)',
  tms602Hot: 'TMS 602 / ACI 530.1 hot-weather construction: above 100 °F, or 90 °F with wind over 8 mph (secondary copy)',
  aci306: 'ACI 306R cold weather: air at or expected below 40 °F during the protection period (concrete.org); 72 h period from memory',
  bs8500: 'BS 8500 / BS EN 206: concrete at least 5 °C at discharge, kept at 5 °C until 5 N/mm² (hanson.co.uk)',
  concreteFreezing: 'Common practice, no source: no pour into freezing air without a heated enclosure',
  rainFresh: 'Common practice, no source: rain thresholds for fresh mortar, render and concrete; NBS F10/185 says cover the work',
  rainHeavy: 'Met Office: heavy rain above 4 mm/h (from memory); stop rule common practice, no source',
  usableHours: 'Common practice, no source: a day with fewer usable hours than this is not worth starting',
  forecast: 'Hodboard: every working hour needs a forecast hour',
  forecastReach: 'Hodboard: a look-ahead rule is checked on the hours forecast only; hours missing within the day and the next 48 h are a caution',
  forecastBeyond: 'Hodboard: a look-ahead period past the day and the next 48 h is noted, not a caution; forecasts are read again as they extend',
} as const;

export type SourceKey = keyof typeof SOURCES;
