// Invented makes, model series, dealers and places for the bench's 50 000 listings. Every name here is
// made up for the bench; none stands for a real maker, dealer or town.

export const makes = [
  "Aldermark", "Brevholt", "Caskely", "Dunmere", "Eskervane", "Fennholt", "Galloway-Reiss", "Harrowden",
  "Istvaro", "Jorvelle", "Kessling", "Lunderby", "Marrowfield", "Norrhaven", "Orsay-Lindqvist", "Pellworth",
  "Quarrendon", "Rastelli-Vorn", "Sandvero", "Talvera", "Ulmstead", "Varnholt", "Wendeross", "Yarrowby",
  "Zellmark", "Brandmoor", "Corvaine", "Dellacorte", "Hallveig", "Strommen-Ackray",
] as const;

export const modelPrefixes = ["KD", "TR", "ML", "SL", "HX", "VT", "PX", "GL", "CT", "DR", "NV", "RT"] as const;
export const modelSuffixes = ["", "", "", " Precision", " Gap", " S", " Mk II", " Universal", " Heavy", " Plus"] as const;

/** Invented towns with invented regions, in countries the listing form offers. */
export const places = [
  { city: "Ostervik", region: "Lower Haldmark", country: "NO" },
  { city: "Brennsund", region: "Upper Haldmark", country: "NO" },
  { city: "Whitcombe Ferry", region: "Marlshire", country: "GB" },
  { city: "Ashcombe Vale", region: "Corrisford", country: "GB" },
  { city: "Kettlesby", region: "Marlshire", country: "GB" },
  { city: "Saint-Aubrel", region: "Haute-Vernois", country: "FR" },
  { city: "Montvaleine", region: "Basse-Vernois", country: "FR" },
  { city: "Eschenbrück", region: "Altmarken", country: "DE" },
  { city: "Hollenstedt-Ried", region: "Südwaldgau", country: "DE" },
  { city: "Kranzfeld", region: "Altmarken", country: "DE" },
  { city: "Vellinge Strand", region: "Norrskog", country: "SE" },
  { city: "Tallmora", region: "Norrskog", country: "SE" },
  { city: "Borgovalle", region: "Valdera", country: "IT" },
  { city: "San Cresto", region: "Valdera", country: "IT" },
  { city: "Ravenhoek", region: "Westerpolder", country: "NL" },
  { city: "Drielanden", region: "Westerpolder", country: "NL" },
  { city: "Liesenau", region: "Obertal", country: "AT" },
  { city: "Pradolena", region: "Serranía Alta", country: "ES" },
  { city: "Kovarny", region: "Horní Lesno", country: "CZ" },
  { city: "Wierzbno Małe", region: "Pojezierze", country: "PL" },
  { city: "Harlow Creek", region: "Tamarack County", country: "US" },
  { city: "Millbrook Falls", region: "Kestrel Valley", country: "US" },
  { city: "Port Aldous", region: "Eastmere", country: "CA" },
  { city: "Carrowmore Bay", region: "Westreach", country: "IE" },
] as const;

export const dealerNames = [
  "Kessling & Daughters Machine Tools", "Brandmoor Used Machinery", "Atelier Vernois", "Haldmark Lathe Exchange",
  "Marlshire Plant & Tooling", "Altmarken Werkzeugmaschinen", "Norrskog Verkstadsmaskiner", "Valdera Macchine",
  "Westerpolder Machinehandel", "Obertal Drehmaschinen", "Corrisford Engineering Sales", "Tamarack Machine Exchange",
  "Kestrel Valley Tooling", "Eastmere Industrial Resale", "Westreach Machine Tools", "Serranía Maquinaria",
  "Horní Lesno Stroje", "Pojezierze Obrabiarki", "Upper Haldmark Rebuilds", "Basse-Vernois Occasions",
  "Südwaldgau Maschinenhandel", "Ashcombe Reconditioning", "Kettlesby Lathe Works", "Brennsund Maskin",
  "Tallmora Begagnade Maskiner", "San Cresto Torni", "Drielanden Draaibanken", "Liesenau Präzision",
  "Montvaleine Machines-Outils", "Harlow Creek Lathes", "Millbrook Tool & Die Sales", "Port Aldous Machinery",
  "Carrowmore Engineering", "Ravenhoek Techniek", "Kovarny Soustruhy", "Pradolena Tornos", "Ostervik Maskin",
  "Eschenbrück Gebrauchtmaschinen", "Borgovalle Meccanica", "Wierzbno Maszyny",
] as const;

export const inspectorNames = ["Tobiah Renner", "Agathe Mirelle", "Osric Halloway", "Ingrid Vassberg", "Matteo Cerrani", "Lieve Dormaels"] as const;

export const spindleNoses = ["D1-4 camlock", "D1-5 camlock", "D1-6 camlock", "A1-6", "A2-5", "A2-6", "L0 long taper", "L1 long taper", "Threaded 1½\"-8"] as const;

export const openings = [
  "Rebuilt in our own shop:",
  "Out of a gauge maker's toolroom;",
  "From a college workshop, lightly used:",
  "Taken out of production last month;",
  "One careful owner since new:",
  "Sold as seen, for a rebuild:",
] as const;

export const details = [
  "bed ways reground and saddle re-scraped.",
  "spindle bearings replaced with a matched pair.",
  "gearbox opened, cleaned and every shaft checked.",
  "leadscrew and half-nuts in good order.",
  "cross-slide backlash about 0.1 mm.",
  "new way wipers and a fresh coat of paint.",
  "runs quietly through every speed.",
  "coolant pump and work light included.",
  "original paint, very little wear near the headstock.",
  "motor rewound, new contactors in the cabinet.",
] as const;

export const closings = [
  "You are welcome to see it cutting before you decide.",
  "Loaded onto your transport with our forklift.",
  "Needs a 400 V supply.",
  "Can be shown under power by appointment.",
  "Needs a crane or a machinery skate team to move.",
] as const;

export const tooling = [
  null,
  "3-jaw and 4-jaw chucks, faceplate, fixed steady",
  "Collet set 3–25 mm, taper turning attachment",
  "Quick-change tool post with six holders",
  "3-jaw chuck, faceplate, coolant pump, work light",
] as const;
