#!/usr/bin/env node
// Writes the invented demo fixtures under fixtures/ (the company "Quillfeather Instruments" and the monorepo
// "tidewater"). Everything is made up. Deterministic: a seeded PRNG per file, integer arithmetic for every
// number written, no clock, no locale; running it twice gives byte-identical files.
// Usage: node scripts/make-fixtures.js   (or: npm run fixtures)

import { mkdirSync, writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

const repoRoot = join(dirname(fileURLToPath(import.meta.url)), "..");
const outDir = join(repoRoot, "fixtures");

// ---------------------------------------------------------------------------------------------------------
// Seeded PRNG (mulberry32) and helpers. Only +, *, floor and bit operations: identical on every platform.

function makeRng(seed) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const int = (lo, hi) => lo + Math.floor(next() * (hi - lo + 1));
  return {
    next,
    int,
    chance: (p) => next() < p,
    pick: (items) => items[Math.floor(next() * items.length)],
    /** Index chosen with integer weights. */
    weighted: (weights) => {
      let total = 0;
      for (const w of weights) total += w;
      let x = Math.floor(next() * total);
      for (let i = 0; i < weights.length; i++) {
        x -= weights[i];
        if (x < 0) return i;
      }
      return weights.length - 1;
    },
    /** Integer in [lo, hi], skewed towards lo (cube of a uniform). */
    skewed: (lo, hi) => {
      const u = next();
      return lo + Math.floor(u * u * u * (hi - lo));
    },
    shuffle: (items) => {
      for (let i = items.length - 1; i > 0; i--) {
        const j = Math.floor(next() * (i + 1));
        const t = items[i];
        items[i] = items[j];
        items[j] = t;
      }
      return items;
    },
  };
}

function write(name, text) {
  const file = join(outDir, name);
  mkdirSync(dirname(file), { recursive: true });
  writeFileSync(file, text);
  return file;
}

function lineCount(text) {
  return text.split("\n").length - 1;
}

// ---------------------------------------------------------------------------------------------------------
// a. fixtures/quillfeather-org.csv: org chart of Quillfeather Instruments.

/** Title ladders per job family: [title, weight, yearly cost]. */
const FAMILIES = {
  fw: {
    ics: [
      ["Associate Firmware Engineer", 10, 98000],
      ["Firmware Engineer", 40, 122000],
      ["Senior Firmware Engineer", 30, 149000],
      ["Staff Firmware Engineer", 8, 176000],
      ["Principal Firmware Engineer", 2, 204000],
    ],
    lead: ["Lead Firmware Engineer", 168000],
    manager: ["Engineering Manager", 184000],
    intern: ["Firmware Intern", 52000],
  },
  sw: {
    ics: [
      ["Associate Software Engineer", 10, 96000],
      ["Software Engineer", 40, 121000],
      ["Senior Software Engineer", 30, 148000],
      ["Staff Software Engineer", 8, 175000],
      ["Principal Software Engineer", 2, 203000],
    ],
    lead: ["Lead Software Engineer", 166000],
    manager: ["Engineering Manager", 182000],
    intern: ["Software Intern", 50000],
  },
  sre: {
    ics: [
      ["Site Reliability Engineer", 40, 128000],
      ["Senior Site Reliability Engineer", 30, 154000],
      ["Staff Site Reliability Engineer", 6, 179000],
    ],
    lead: ["Lead Site Reliability Engineer", 170000],
    manager: ["Engineering Manager", 184000],
  },
  qa: {
    ics: [
      ["QA Engineer", 40, 104000],
      ["Senior QA Engineer", 25, 126000],
      ["Test Automation Engineer", 20, 118000],
    ],
    lead: ["QA Lead", 138000],
    manager: ["QA Manager", 152000],
  },
  ee: {
    ics: [
      ["Electrical Engineer", 40, 118000],
      ["Senior Electrical Engineer", 30, 143000],
      ["Staff Electrical Engineer", 8, 171000],
      ["Layout Designer", 10, 97000],
    ],
    lead: ["Lead Electrical Engineer", 160000],
    manager: ["Hardware Engineering Manager", 178000],
    intern: ["Electrical Engineering Intern", 48000],
  },
  optics: {
    ics: [
      ["Optical Engineer", 40, 121000],
      ["Senior Optical Engineer", 30, 147000],
      ["Principal Optical Scientist", 5, 198000],
      ["Optics Technician", 20, 71000],
    ],
    lead: ["Lead Optical Engineer", 162000],
    manager: ["Hardware Engineering Manager", 178000],
  },
  mech: {
    ics: [
      ["Mechanical Engineer", 40, 112000],
      ["Senior Mechanical Engineer", 30, 137000],
      ["Design Drafter", 15, 78000],
    ],
    lead: ["Lead Mechanical Engineer", 152000],
    manager: ["Mechanical Engineering Manager", 168000],
    intern: ["Mechanical Engineering Intern", 46000],
  },
  test: {
    ics: [
      ["Test Engineer", 40, 101000],
      ["Senior Test Engineer", 25, 124000],
      ["Test Technician", 30, 66000],
    ],
    lead: ["Lead Test Engineer", 136000],
    manager: ["Test Engineering Manager", 151000],
  },
  pm: {
    ics: [
      ["Product Manager", 40, 139000],
      ["Senior Product Manager", 25, 163000],
      ["Product Designer", 25, 121000],
    ],
    lead: ["Group Product Manager", 181000],
    manager: ["Product Management Lead", 176000],
  },
  tech: {
    ics: [
      ["Production Technician I", 40, 52000],
      ["Production Technician II", 30, 59000],
      ["Senior Production Technician", 12, 68000],
      ["Assembler", 25, 47000],
    ],
    lead: ["Lead Technician", 73000],
    manager: ["Production Supervisor", 86000],
    intern: ["Production Apprentice", 34000],
  },
  cal: {
    ics: [
      ["Calibration Technician", 40, 64000],
      ["Senior Calibration Technician", 20, 74000],
      ["Metrology Technician", 15, 71000],
    ],
    lead: ["Lead Calibration Technician", 79000],
    manager: ["Calibration Supervisor", 92000],
    intern: ["Calibration Apprentice", 36000],
  },
  quality: {
    ics: [
      ["Quality Inspector", 40, 58000],
      ["Quality Engineer", 30, 97000],
      ["Senior Quality Engineer", 12, 118000],
    ],
    lead: ["Lead Quality Inspector", 69000],
    manager: ["Quality Manager", 121000],
  },
  supply: {
    ics: [
      ["Buyer", 30, 72000],
      ["Senior Buyer", 15, 88000],
      ["Supply Planner", 25, 79000],
      ["Supplier Quality Engineer", 10, 99000],
    ],
    lead: ["Lead Buyer", 96000],
    manager: ["Supply Chain Manager", 118000],
  },
  logistics: {
    ics: [
      ["Warehouse Associate", 40, 44000],
      ["Senior Warehouse Associate", 15, 51000],
      ["Logistics Coordinator", 20, 58000],
      ["Forklift Operator", 15, 47000],
    ],
    lead: ["Warehouse Lead", 61000],
    manager: ["Logistics Manager", 94000],
  },
  sales: {
    ics: [
      ["Sales Development Representative", 25, 68000],
      ["Account Executive", 40, 104000],
      ["Senior Account Executive", 20, 131000],
      ["Key Account Manager", 10, 142000],
    ],
    lead: ["Sales Team Lead", 139000],
    manager: ["Regional Sales Manager", 158000],
  },
  se: {
    ics: [
      ["Sales Engineer", 40, 117000],
      ["Senior Sales Engineer", 25, 139000],
      ["Applications Scientist", 15, 124000],
    ],
    lead: ["Lead Sales Engineer", 149000],
    manager: ["Sales Engineering Manager", 164000],
  },
  support: {
    ics: [
      ["Support Specialist", 40, 56000],
      ["Senior Support Specialist", 20, 66000],
      ["Support Engineer", 25, 84000],
    ],
    lead: ["Support Team Lead", 78000],
    manager: ["Support Manager", 104000],
  },
  field: {
    ics: [
      ["Field Service Engineer", 40, 87000],
      ["Senior Field Service Engineer", 20, 104000],
      ["Field Service Technician", 25, 67000],
    ],
    lead: ["Lead Field Service Engineer", 111000],
    manager: ["Field Service Manager", 126000],
  },
  docs: {
    ics: [
      ["Technical Writer", 40, 88000],
      ["Senior Technical Writer", 20, 104000],
      ["Instructional Designer", 20, 86000],
      ["Customer Trainer", 20, 79000],
    ],
    lead: ["Documentation Lead", 112000],
    manager: ["Training & Documentation Manager", 124000],
  },
  fin: {
    ics: [
      ["Accounts Assistant", 20, 52000],
      ["Accountant", 40, 78000],
      ["Senior Accountant", 20, 96000],
      ["Financial Analyst", 25, 92000],
    ],
    lead: ["Accounting Lead", 108000],
    manager: ["Finance Manager", 131000],
  },
  legal: {
    ics: [
      ["Paralegal", 30, 71000],
      ["Counsel", 30, 168000],
      ["Senior Counsel", 12, 196000],
      ["Contracts Manager", 15, 112000],
    ],
    lead: ["Lead Counsel", 205000],
    manager: ["Legal Manager", 182000],
  },
  people: {
    ics: [
      ["Recruiter", 35, 79000],
      ["Senior Recruiter", 15, 94000],
      ["Recruiting Coordinator", 20, 56000],
      ["People Partner", 25, 97000],
      ["Payroll Specialist", 10, 64000],
    ],
    lead: ["Recruiting Lead", 104000],
    manager: ["People Manager", 121000],
  },
  it: {
    ics: [
      ["IT Support Technician", 40, 58000],
      ["Systems Administrator", 30, 86000],
      ["Senior Systems Administrator", 12, 104000],
      ["Network Engineer", 12, 98000],
    ],
    lead: ["IT Support Lead", 92000],
    manager: ["IT Manager", 124000],
  },
  facilities: {
    ics: [
      ["Facilities Coordinator", 30, 54000],
      ["Facilities Technician", 40, 57000],
      ["Health & Safety Officer", 10, 72000],
    ],
    lead: ["Facilities Lead", 66000],
    manager: ["Facilities Manager", 96000],
  },
};

/** A team: a manager and `lo..hi` (times 5/2) people below; over 12 people get leads between. */
const team = (name, fam, lo, hi, extra = {}) => ({
  team: name,
  fam,
  size: [Math.floor((lo * 5) / 2), Math.floor((hi * 5) / 2)],
  ...extra,
});
/** A unit with a head and sub-units. */
const unit = (head, name, cost, units, staff = []) => ({ head, team: name, cost, units, staff });

const plantUnits = (plant) => [
  unit("Senior Manager, Production", `${plant} Production`, 138000, [
    team(`${plant} Surface Mount`, "tech", 22, 34, { manager: "Shift Manager" }),
    team(`${plant} Assembly`, "tech", 30, 46, { manager: "Shift Manager" }),
    team(`${plant} Final Assembly`, "tech", 18, 28, { manager: "Shift Manager" }),
  ]),
  unit("Senior Manager, Calibration", `${plant} Calibration`, 132000, [
    team(`${plant} Calibration Line`, "cal", 16, 26),
    team(`${plant} Final Inspection`, "quality", 10, 18),
  ]),
  team(`${plant} Maintenance`, "facilities", 6, 10, { manager: "Maintenance Manager" }),
];

const ORG = unit(
  "Chief Executive Officer",
  "Office of the CEO",
  720000,
  [
    unit("Vice President, Hardware Engineering", "Hardware Engineering", 352000, [
      unit("Director, Optics & Photonics", "Optics & Photonics", 236000, [
        team("Lens Design", "optics", 8, 14),
        team("Laser Sources", "optics", 10, 16),
        team("Optical Test", "test", 9, 15),
      ]),
      unit("Director, Analog Electronics", "Analog Electronics", 238000, [
        team("Front-End Circuits", "ee", 12, 18),
        team("Power Design", "ee", 8, 13),
        team("Signal Integrity", "ee", 6, 10),
        team("PCB Layout", "ee", 6, 9),
      ]),
      unit("Director, Mechanical Design", "Mechanical Design", 226000, [
        team("Enclosures", "mech", 8, 12),
        team("Thermal Engineering", "mech", 5, 8),
        team("Precision Mechanisms", "mech", 9, 14),
      ]),
      unit("Director, Hardware Validation", "Hardware Validation", 219000, [
        team("Environmental Test", "test", 10, 15),
        team("Compliance Lab", "test", 6, 10),
        team("Reliability", "test", 7, 11),
      ]),
      unit("Director, Product Management", "Hardware Product", 231000, [
        team("Bench Instruments Product", "pm", 5, 8),
        team("Field Instruments Product", "pm", 5, 8),
      ]),
    ]),
    unit("Vice President, Software & Firmware", "Software & Firmware", 361000, [
      unit("Director, Embedded Systems", "Embedded Systems", 241000, [
        unit("Senior Manager, Sensor Platforms", "Sensor Platforms", 203000, [
          team("Sensor Firmware", "fw", 21, 24),
          team("Calibration Software", "sw", 8, 12),
          team("Signal Processing", "fw", 9, 14),
        ]),
        unit("Senior Manager, Device Platform", "Device Platform", 201000, [
          team("Bootloader & Updates", "fw", 6, 10),
          team("Real-Time Kernel", "fw", 7, 11),
          team("Motor Control Firmware", "fw", 8, 13),
        ]),
      ]),
      unit("Director, Instrument Software", "Instrument Software", 238000, [
        team("Desktop Suite", "sw", 14, 22),
        team("Data Acquisition", "sw", 10, 15),
        team("Visualisation", "sw", 8, 12),
        team("Scripting Interface", "sw", 6, 9),
      ]),
      unit("Director, Cloud Platform", "Cloud Platform", 244000, [
        unit("Senior Manager, Telemetry", "Telemetry", 205000, [
          team("Fleet Telemetry", "sw", 10, 16),
          team("Data Pipeline", "sw", 9, 14),
          team("Device Registry", "sw", 6, 9),
        ]),
        team("Site Reliability", "sre", 8, 12),
        team("Identity & Access", "sw", 6, 9),
      ]),
      unit("Director, Developer Productivity", "Developer Productivity", 229000, [
        team("Build & Release", "sw", 6, 10),
        team("Test Infrastructure", "sw", 6, 9),
        team("Test Automation", "qa", 9, 14),
        team("Release Quality", "qa", 7, 11),
      ]),
      unit("Director, Software Product", "Software Product", 233000, [
        team("Platform Product", "pm", 5, 8),
        team("Design Studio", "pm", 5, 9),
      ]),
    ]),
    unit("Vice President, Operations", "Operations", 334000, [
      unit("Senior Director, Plant Operations", "Plant Operations", 262000, [
        unit("Director, Harrowgate Plant", "Harrowgate Plant", 214000, plantUnits("Harrowgate")),
        unit("Director, Lowmere Plant", "Lowmere Plant", 211000, plantUnits("Lowmere")),
      ]),
      unit("Director, Supply Chain", "Supply Chain", 219000, [
        team("Procurement", "supply", 12, 18),
        team("Supplier Quality", "supply", 6, 10),
        unit("Senior Manager, Logistics", "Logistics", 136000, [
          team("Inbound Logistics", "logistics", 14, 22),
          team("Distribution", "logistics", 16, 24),
        ]),
      ]),
      unit("Director, Quality Assurance", "Quality Assurance", 208000, [
        team("Metrology Lab", "cal", 8, 12),
        team("Quality Systems", "quality", 6, 10),
        team("Incoming Inspection", "quality", 9, 14),
      ]),
    ]),
    unit("Vice President, Sales", "Sales", 348000, [
      unit("Director, North Region", "North Region", 226000, [
        team("North Key Accounts", "sales", 8, 12),
        team("North Territory Sales", "sales", 12, 20),
      ]),
      unit("Director, Southern Region", "Southern Region", 224000, [
        team("Southern Key Accounts", "sales", 7, 11),
        team("Southern Territory Sales", "sales", 12, 18),
      ]),
      unit("Director, Coastal Region", "Coastal Region", 221000, [
        team("Coastal Territory Sales", "sales", 10, 16),
        team("Marine Research Accounts", "sales", 6, 9),
      ]),
      unit("Director, International Sales", "International Sales", 233000, [
        unit("Senior Manager, Export Markets", "Export Markets", 171000, [
          team("Export Sales East", "sales", 9, 14),
          team("Export Sales West", "sales", 9, 14),
          team("Distributor Partners", "sales", 6, 10),
        ]),
      ]),
      unit("Director, Sales Engineering", "Sales Engineering", 228000, [
        team("Applications Lab", "se", 8, 12),
        team("Pre-Sales Engineering", "se", 12, 18),
      ]),
    ]),
    unit("Vice President, Customer Success", "Customer Success", 322000, [
      unit("Director, Field Service", "Field Service", 204000, [
        team("Field Service North", "field", 12, 18),
        team("Field Service South", "field", 12, 18),
        team("Field Service International", "field", 10, 16),
        team("Repair Depot", "tech", 12, 18, { manager: "Depot Supervisor" }),
      ]),
      unit("Director, Technical Support", "Technical Support", 198000, [
        team("Support Tier 1", "support", 20, 28),
        team("Support Tier 2", "support", 12, 18),
        team("Escalation Engineering", "support", 6, 9),
      ]),
      team("Training & Documentation", "docs", 10, 14),
    ]),
    unit("Vice President, Finance & Legal", "Finance & Legal", 341000, [
      unit("Director, Accounting", "Accounting", 206000, [
        team("General Ledger", "fin", 7, 11),
        team("Payables & Receivables", "fin", 8, 12),
      ]),
      team("Planning & Analysis", "fin", 6, 9, { manager: "Head of Planning & Analysis" }),
      team("Legal", "legal", 6, 10, { manager: "General Counsel" }),
    ]),
    unit("Vice President, People & Workplace", "People & Workplace", 312000, [
      unit("Director, Talent", "Talent", 196000, [
        team("Recruiting", "people", 12, 18),
        team("People Partners", "people", 7, 11),
      ]),
      unit("Director, Workplace", "Workplace", 189000, [
        team("IT Services", "it", 14, 20),
        team("Facilities", "facilities", 10, 16),
      ]),
    ]),
  ],
  [
    ["Chief of Staff", 212000],
    ["Executive Assistant", 88000],
  ],
);

const GIVEN = [
  "Ines",
  "Marit",
  "Tomas",
  "Aiko",
  "Ravi",
  "Lena",
  "Oskar",
  "Nadia",
  "Kofi",
  "Priya",
  "Mateo",
  "Hana",
  "Jonas",
  "Amara",
  "Elias",
  "Yuki",
  "Farah",
  "Niko",
  "Sofia",
  "Dario",
  "Leila",
  "Anton",
  "Mira",
  "Sami",
  "Ilse",
  "Kenji",
  "Talia",
  "Bruno",
  "Noor",
  "Emil",
  "Zara",
  "Felix",
  "Rosa",
  "Idris",
  "Greta",
  "Omar",
  "Vera",
  "Luca",
  "Ada",
  "Tariq",
  "Linnea",
  "Caleb",
  "Esme",
  "Jalen",
  "Ingrid",
  "Rafael",
  "Maya",
  "Henrik",
  "Chidi",
  "Selma",
  "Arjun",
  "Nell",
  "Pavel",
  "Signe",
  "Malik",
  "Thea",
  "Joaquin",
  "Kaia",
  "Ruben",
  "Wren",
  "Asha",
  "Bastian",
  "Clio",
  "Dov",
  "Eira",
  "Fenna",
  "Goran",
  "Hedda",
  "Ivo",
  "Juno",
  "Kasimir",
  "Lior",
];
const FAMILY_START = [
  "Al",
  "Bren",
  "Cas",
  "Dal",
  "Es",
  "Fen",
  "Gar",
  "Hol",
  "Ist",
  "Jor",
  "Kel",
  "Lar",
  "Mor",
  "Nes",
  "Or",
  "Pell",
  "Quin",
  "Ros",
  "Sal",
  "Tam",
  "Ul",
  "Ver",
  "Wen",
  "Yar",
  "Zel",
  "Ash",
  "Brey",
  "Corr",
  "Dun",
  "Ember",
];
const FAMILY_END = [
  "bek",
  "dahl",
  "ford",
  "gaard",
  "holm",
  "ino",
  "kova",
  "lund",
  "mere",
  "nik",
  "oza",
  "quist",
  "rian",
  "stad",
  "ton",
  "vik",
  "wood",
  "ez",
  "ari",
  "sen",
  "idge",
  "ova",
  "acre",
  "by",
];

/** Display names with non-ASCII letters, for width and escaping demos. */
const SPECIAL_NAMES = ["Zoé Varlind", "Søren Haldvik", "Łucja Brzenka", "Paweł Ostrowin", "Jørgen Tellstad"];
const CJK_NAME = "林 澄雨";
const QUOTED_NAME = 'Tomas "Tam" Erlind';
const DEMO = {
  id: "Q2417",
  name: "Marit Okonkwo-Lund",
  title: "Staff Firmware Engineer",
  team: "Sensor Firmware",
  depth: 6,
};

function makeOrg() {
  const r = makeRng(0x51f1a7e);
  const used = new Set([DEMO.name, CJK_NAME, QUOTED_NAME, ...SPECIAL_NAMES]);
  const familyName = () => r.pick(FAMILY_START) + r.pick(FAMILY_END);
  const newName = () => {
    for (;;) {
      let family = familyName();
      if (r.chance(0.05)) family += `-${familyName()}`;
      const name = `${r.pick(GIVEN)} ${family}`;
      if (!used.has(name)) {
        used.add(name);
        return name;
      }
    }
  };
  const cost = (base) => Math.round((base * (90 + r.int(0, 22))) / 5000) * 50;

  /** People in pre-order: { parent, depth, name, title, team, cost, fam }. */
  const people = [];
  const add = (parent, depth, title, teamName, base, fam = "") => {
    people.push({ parent, depth, name: newName(), title, team: teamName, cost: cost(base), fam });
    return people.length - 1;
  };
  const icOf = (fam) => fam.ics[r.weighted(fam.ics.map((t) => t[1]))];

  const buildTeam = (spec, parent, depth) => {
    const fam = FAMILIES[spec.fam];
    const mgrTitle = spec.manager ?? fam.manager[0];
    const mgr = add(parent, depth, mgrTitle, spec.team, fam.manager[1], spec.fam);
    const n = r.int(spec.size[0], spec.size[1]);
    const leadCount = n > 12 ? Math.ceil(n / 8) : 0;
    if (leadCount === 0) {
      // A small team sometimes has an intern or apprentice under one of its people: one level more.
      const mentor = fam.intern && r.chance(0.2) ? r.int(0, n - 1) : -1;
      for (let k = 0; k < n; k++) {
        const [title, , base] = icOf(fam);
        const ic = add(mgr, depth + 1, title, spec.team, base, spec.fam);
        if (k === mentor) add(ic, depth + 2, fam.intern[0], spec.team, fam.intern[1], spec.fam);
      }
      return;
    }
    // Each lead's people are generated right after the lead, so the list stays in pre-order.
    const per = Math.floor((n - leadCount) / leadCount);
    let rest = n - leadCount - per * leadCount;
    for (let l = 0; l < leadCount; l++) {
      const lead = add(mgr, depth + 1, fam.lead[0], spec.team, fam.lead[1], spec.fam);
      const mine = per + (rest > 0 ? 1 : 0);
      if (rest > 0) rest--;
      for (let k = 0; k < mine; k++) {
        const [title, , base] = icOf(fam);
        const ic = add(lead, depth + 2, title, spec.team, base, spec.fam);
        if (fam.intern && r.chance(0.05))
          add(ic, depth + 3, fam.intern[0], spec.team, fam.intern[1], spec.fam);
      }
    }
  };

  const build = (spec, parent, depth) => {
    if (!spec.units) return buildTeam(spec, parent, depth);
    const head = add(parent, depth, spec.head, spec.team, spec.cost);
    for (const [title, base] of spec.staff) add(head, depth + 1, title, spec.team, base);
    for (const u of spec.units) build(u, head, depth + 1);
  };
  build(ORG, -1, 0);

  // The README demo person: the first Sensor Firmware engineer at depth 6 under a lead.
  const demoAt = people.findIndex(
    (p) => p.team === DEMO.team && p.depth === DEMO.depth && p.title.includes("Firmware Engineer"),
  );
  if (demoAt < 0) throw new Error("no place for the demo person");
  Object.assign(people[demoAt], {
    name: DEMO.name,
    title: DEMO.title,
    cost: cost(FAMILIES.fw.ics[3][2]),
  });
  // Two colleagues under the same lead get the CJK and one accented name (width tests next to the demo).
  const mates = people
    .map((_, i) => i)
    .filter((i) => i !== demoAt && people[i].parent === people[demoAt].parent);
  people[mates[0]].name = CJK_NAME;
  people[mates[1]].name = SPECIAL_NAMES[0];
  // The other special names go to individual contributors spread over the company.
  const managers = new Set(people.map((p) => p.parent));
  const leaves = people.map((_, i) => i).filter((i) => !managers.has(i));
  const specialIds = [];
  for (const name of [...SPECIAL_NAMES.slice(1), QUOTED_NAME]) {
    let at;
    do at = r.pick(leaves);
    while (at === demoAt || mates.includes(at) || specialIds.includes(at));
    people[at].name = name;
    specialIds.push(at);
  }

  // Ids: the CEO is Q0001, everyone else gets a shuffled number; the demo person is Q2417.
  const n = people.length;
  const numbers = r.shuffle(Array.from({ length: n - 1 }, (_, k) => k + 2));
  const num = [1, ...numbers];
  const demoNum = Number(DEMO.id.slice(1));
  const holder = num.indexOf(demoNum);
  if (holder < 0) throw new Error(`only ${n} people: no id ${DEMO.id}`);
  num[holder] = num[demoAt];
  num[demoAt] = demoNum;
  const id = (i) => `Q${String(num[i]).padStart(4, "0")}`;

  const rows = people.map((p, i) => ({ ...p, i, id: id(i), manager: p.parent < 0 ? "" : id(p.parent) }));
  rows.sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  const csvField = (s) => (/[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
  let text = "id,manager,name,title,team,cost\n";
  for (const p of rows) {
    text += [p.id, p.manager, p.name, p.title, p.team, String(p.cost)].map(csvField).join(",") + "\n";
  }

  const namePath = (i) => {
    const names = [];
    for (let k = i; people[k].parent >= 0; k = people[k].parent) names.unshift(people[k].name);
    return names.join("/");
  };
  let maxDepth = 0;
  for (const p of people) maxDepth = Math.max(maxDepth, p.depth);
  return {
    text,
    summary: [
      `${n} people, depth up to ${maxDepth} (edges below the CEO)`,
      `demo person ${id(demoAt)} "${people[demoAt].name}", ${people[demoAt].title}, ${people[demoAt].team}, depth ${people[demoAt].depth}`,
      `  path: ${namePath(demoAt)}`,
      `  beside it: ${id(mates[0])} "${CJK_NAME}", ${id(mates[1])} "${SPECIAL_NAMES[0]}"`,
      `  other special names: ${specialIds.map((i) => `${id(i)} "${people[i].name}"`).join(", ")}`,
    ],
  };
}

// ---------------------------------------------------------------------------------------------------------
// b. fixtures/tidewater-files.paths: `find . -printf '%s\t%p\n'` of the tidewater monorepo.

const MODULE_DIRS = [
  "adapters",
  "api",
  "handlers",
  "models",
  "store",
  "codecs",
  "sensors",
  "ingest",
  "schema",
  "util",
  "internal",
  "routes",
  "jobs",
  "metrics",
  "config",
  "events",
  "queue",
  "auth",
  "render",
  "math",
  "io",
  "proto",
  "net",
  "cache",
  "workers",
  "migrations",
  "reports",
  "alerts",
  "clients",
  "pipeline",
];
const FILE_STEMS = [
  "index",
  "types",
  "errors",
  "parser",
  "encoder",
  "decoder",
  "client",
  "server",
  "retry",
  "backoff",
  "buffer",
  "window",
  "checksum",
  "frame",
  "reader",
  "writer",
  "registry",
  "session",
  "token",
  "limits",
  "clock",
  "units",
  "format",
  "validate",
  "merge",
  "snapshot",
  "batch",
  "stream",
  "pool",
  "router",
  "handler",
  "mapper",
  "scheduler",
  "ledger",
  "entry",
  "balance",
  "account",
  "tide",
  "gauge",
  "reading",
  "station",
  "calibrate",
  "filter",
  "spline",
  "harmonic",
  "datum",
  "surge",
  "threshold",
  "notify",
  "sync",
  "cursor",
  "tile",
  "palette",
  "legend",
  "journal",
  "posting",
  "currency",
  "rounding",
  "settle",
  "audit",
];
const STATIONS = ["north-pier", "gull-rock", "saltmarsh-bend", "east-jetty", "kelp-point", "harrow-inlet"];
const SERVICES = [
  "ledger",
  "tide-gauge",
  "harbor-api",
  "buoy-ingest",
  "chart-render",
  "mooring-auth",
  "surge-alerts",
  "estuary-sync",
];
const LIBS = [
  "ledger-core",
  "brackish-streams",
  "salt-config",
  "undertow-log",
  "kelp-cache",
  "tidal-math",
  "shoal-ui",
  "riptide-rpc",
  "fathom-units",
  "spindrift-test",
];
const TOOLS = ["codegen", "lint-rules", "release", "bench-harness", "fixture-forge"];

function makeFiles() {
  const r = makeRng(0x71de3a7e);
  const dir = () => ({ dir: true, kids: new Map() });
  const root = dir();
  /** Adds a file (or directory when size is null) at a slash path, creating parents. */
  const put = (path, size) => {
    const parts = path.split("/");
    let cur = root;
    for (let k = 0; k < parts.length - 1; k++) {
      if (!cur.kids.has(parts[k])) cur.kids.set(parts[k], dir());
      cur = cur.kids.get(parts[k]);
    }
    const last = parts[parts.length - 1];
    if (size === null) {
      if (!cur.kids.has(last)) cur.kids.set(last, dir());
    } else cur.kids.set(last, { dir: false, size });
  };
  const src = () => r.skewed(180, 26000);
  const stems = (count) => r.shuffle([...FILE_STEMS]).slice(0, count);

  /** A source tree: some files, some sub-modules, less branching deeper down. */
  const moduleTree = (base, level, ext, tests) => {
    const files = stems(r.int(2, level === 0 ? 9 : 6));
    for (const f of files) {
      put(`${base}/${f}.${ext}`, src());
      if (tests && r.chance(0.7)) put(`${tests}/${f}.test.${ext}`, r.skewed(400, 18000));
    }
    const subCount = level === 0 ? r.int(3, 6) : level < 4 ? r.int(0, 4 - level) : 0;
    for (const d of r.shuffle([...MODULE_DIRS]).slice(0, subCount)) {
      moduleTree(`${base}/${d}`, level + 1, ext, tests && `${tests}/${d}`);
    }
  };

  const pkg = (base, kind) => {
    put(`${base}/package.json`, r.int(420, 2400));
    put(`${base}/README.md`, r.skewed(600, 14000));
    if (r.chance(0.6)) put(`${base}/CHANGELOG.md`, r.skewed(900, 60000));
    put(`${base}/src`, null);
    moduleTree(`${base}/src`, 0, "ts", `${base}/test`);
    if (r.chance(0.5)) {
      for (let k = r.int(2, 8); k > 0; k--) {
        put(`${base}/test/fixtures/${r.pick(FILE_STEMS)}-${r.int(1, 40)}.json`, r.skewed(90, 90000));
      }
    }
    if (kind === "service") {
      put(`${base}/config/default.yaml`, r.int(300, 4000));
      put(`${base}/config/production.yaml`, r.int(300, 4000));
      put(`${base}/deploy/service.yaml`, r.int(500, 3000));
      put(`${base}/deploy/alerts.yaml`, r.int(500, 6000));
    }
  };

  put(".", null);
  put("README.md", 9214);
  put("CONTRIBUTING.md", 5402);
  put("LICENSE", 1071);
  put("package.json", 2318);
  put(".env.example", 388);
  for (const s of SERVICES) pkg(`services/${s}`, "service");
  for (const l of LIBS) pkg(`libs/${l}`, "lib");
  for (const t of TOOLS) pkg(`tools/${t}`, "tool");

  // Deep paths (10+ levels).
  const deep = "services/tide-gauge/src/adapters/sensors/vendors/legacy/v2/protocol/frames";
  for (const f of ["checksum.ts", "header.ts", "payload.ts", "index.ts"]) put(`${deep}/${f}`, src());
  const golden = "services/tide-gauge/test/fixtures/golden/stations";
  for (const s of STATIONS) {
    for (const year of ["2023", "2024"]) {
      for (let m = 1; m <= 12; m += r.int(1, 4)) {
        put(`${golden}/${s}/${year}/${String(m).padStart(2, "0")}/readings.csv`, r.skewed(2000, 480000));
      }
    }
  }
  const ledgerDeep = "services/ledger/src/domain/accounts/postings/rules/currency/rounding/modes";
  for (const f of ["half-even.ts", "half-up.ts", "truncate.ts", "index.ts"]) put(`${ledgerDeep}/${f}`, src());

  // A big generated directory: one wide subtree.
  const gen = "libs/riptide-rpc/src/generated/messages";
  const seen = new Set();
  while (seen.size < 260) seen.add(`${r.pick(FILE_STEMS)}-${r.pick(MODULE_DIRS)}.gen.ts`);
  for (const f of seen) put(`${gen}/${f}`, r.skewed(1500, 64000));

  // Large binary data: few files, most of the bytes.
  for (const s of STATIONS) {
    for (const year of ["2021", "2022", "2023", "2024"]) {
      put(`data/tide-tables/${s}/${year}.bin`, r.int(2, 40) * 1048576 + r.int(0, 1048575));
    }
  }
  put("data/tide-tables/index.json", 48213);

  // Docs, including names with a space, accents, a CJK name and a trailing tilde.
  for (let k = 1; k <= 24; k++)
    put(`docs/images/figure-${String(k).padStart(2, "0")}.png`, r.skewed(8000, 900000));
  for (const f of ["architecture.md", "deploy.md", "onboarding.md", "runbook.md", "glossary.md"]) {
    put(`docs/${f}`, r.skewed(1200, 30000));
  }
  put("docs/design notes/Q3 review.md", 12877);
  put("docs/design notes/ledger rounding.md", 7340);
  put("docs/i18n/résumé-template.md", 2210);
  put("docs/i18n/Ærvik-bøje.md", 1804);
  put("libs/shoal-ui/src/i18n/locales/ja/潮汐.json", 3391);
  put("libs/shoal-ui/src/i18n/locales/en/tides.json", 2976);
  put("tools/release/notes.md~", 4410);
  put("tools/release/notes.md", 4521);

  // Print like find: pre-order, a directory before its entries, entries sorted by name.
  const lines = [];
  const walk = (node, path) => {
    if (!node.dir) {
      lines.push(`${node.size}\t${path}`);
      return;
    }
    // ext4 grows a directory by whole blocks as it fills.
    lines.push(`${4096 * Math.max(1, Math.ceil(node.kids.size / 90))}\t${path}`);
    const names = [...node.kids.keys()].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
    for (const name of names) walk(node.kids.get(name), `${path}/${name}`);
  };
  const top = root.kids.get(".");
  root.kids.delete(".");
  for (const [name, node] of root.kids) top.kids.set(name, node);
  walk(top, ".");
  const text = lines.join("\n") + "\n";
  let deepest = 0;
  for (const l of lines) deepest = Math.max(deepest, l.split("/").length - 1);
  return { text, summary: [`${lines.length} lines, deepest path ${deepest} levels below "."`] };
}

// ---------------------------------------------------------------------------------------------------------
// c. fixtures/tidewater-deps.json: dependency tree of tidewater's packages, children as array or object.

const PKG_WORDS = [
  "brackish",
  "briny",
  "tidal",
  "kelp",
  "shoal",
  "eddy",
  "undertow",
  "riptide",
  "spindrift",
  "lagoon",
  "estuary",
  "barnacle",
  "anchor",
  "jetty",
  "swell",
  "fathom",
  "buoy",
  "harbor",
  "wake",
  "drift",
  "marsh",
  "reef",
  "inlet",
  "cove",
  "gull",
  "plankton",
  "coral",
  "squall",
  "brine",
  "breaker",
  "mooring",
  "keel",
];
const PKG_SUFFIXES = [
  "streams",
  "config",
  "cache",
  "log",
  "parse",
  "utils",
  "rpc",
  "glob",
  "path",
  "buffer",
  "events",
  "queue",
  "schema",
  "retry",
  "color",
  "time",
  "hash",
  "lru",
  "socket",
  "fmt",
  "args",
  "codec",
  "pool",
];

function makeDeps() {
  const r = makeRng(0xde95);
  // A pool of third-party packages ordered by rank; a package depends only on higher ranks (no cycles).
  const names = new Set(["brackish-streams"]);
  while (names.size < 170) names.add(`${r.pick(PKG_WORDS)}-${r.pick(PKG_SUFFIXES)}`);
  const pool = [...names].map((name) => ({
    name,
    version: `${r.skewed(0, 12)}.${r.int(0, 24)}.${r.skewed(0, 30)}`,
    size: r.skewed(1800, 2400000),
    deps: [],
    count: 1,
  }));
  for (let i = pool.length - 1; i >= 0; i--) {
    const cap = i < 30 ? 90 : i < 80 ? 30 : i < 120 ? 8 : 1;
    const want = r.int(0, i < 80 ? 5 : 3);
    for (let tries = 0; pool[i].deps.length < want && tries < 20; tries++) {
      const j = r.int(i + 1, pool.length - 1);
      if (j >= pool.length || pool[i].deps.includes(j)) continue;
      if (pool[i].count + pool[j].count > cap) continue;
      pool[i].deps.push(j);
      pool[i].count += pool[j].count;
    }
  }

  const workspace = [
    ...LIBS.map((l) => ({ name: `@tidewater/${l}`, deps: [], ws: [] })),
    ...SERVICES.map((s) => ({ name: `@tidewater/${s}`, deps: [], ws: [] })),
  ];
  for (const w of workspace) {
    w.version = `0.${r.int(1, 30)}.${r.int(0, 9)}`;
    w.size = r.skewed(12000, 900000);
  }
  // Services use a few libs; everything uses some third-party packages.
  for (let k = LIBS.length; k < workspace.length; k++) {
    for (let l = r.int(1, 3); l > 0; l--) {
      const lib = r.int(0, LIBS.length - 1);
      if (!workspace[k].ws.includes(lib)) workspace[k].ws.push(lib);
    }
  }
  const countPool = (i) => pool[i].count;
  const countWs = (w) =>
    1 + w.deps.reduce((s, j) => s + countPool(j), 0) + w.ws.reduce((s, l) => s + countWs(workspace[l]), 0);
  const total = () => 1 + workspace.reduce((s, w) => s + countWs(w), 0);
  for (let guard = 0; total() < 1500 && guard < 1000; guard++) {
    const w = r.pick(workspace);
    const j = r.int(0, pool.length - 1);
    if (!w.deps.includes(j) && total() + countPool(j) <= 1540) w.deps.push(j);
  }

  let nodes = 0;
  let arrays = 0;
  let objects = 0;
  let maxDepth = 0;
  /** One node; children as an array of named nodes or as an object keyed by child name. */
  const nodeOnce = (name, version, size, kids, depth, named) => {
    nodes++;
    maxDepth = Math.max(maxDepth, depth);
    const out = named ? { name, version, size } : { version, size };
    if (kids.length === 0) return out;
    if (r.chance(0.5)) {
      arrays++;
      out.children = kids.map((k) => k.make(depth + 1, true));
    } else {
      objects++;
      out.children = Object.fromEntries(kids.map((k) => [k.name, k.make(depth + 1, false)]));
    }
    return out;
  };
  const make =
    (name, version, size, kids) =>
    (depth, named = false) =>
      nodeOnce(name, version, size, kids, depth, named);
  const poolKid = (j) => ({
    name: pool[j].name,
    make: make(pool[j].name, pool[j].version, pool[j].size, pool[j].deps.map(poolKid)),
  });
  const wsKid = (w) => ({
    name: w.name,
    make: make(w.name, w.version, w.size, [...w.ws.map((l) => wsKid(workspace[l])), ...w.deps.map(poolKid)]),
  });
  const tree = nodeOnce("tidewater", "0.0.0", 48213, workspace.map(wsKid), 0, true);

  // Two empty containers, one of each shape: a leaf all the same.
  const firstLeafHolder = (n, wantArray) => {
    const stack = [n];
    while (stack.length) {
      const cur = stack.pop();
      if (cur.children === undefined) continue;
      const kids = Array.isArray(cur.children) ? cur.children : Object.values(cur.children);
      if (Array.isArray(cur.children) === wantArray) {
        const leaf = kids.find((k) => k.children === undefined);
        if (leaf) return leaf;
      }
      for (let k = kids.length - 1; k >= 0; k--) stack.push(kids[k]);
    }
    throw new Error("no leaf");
  };
  firstLeafHolder(tree, true).children = [];
  firstLeafHolder(tree, false).children = {};

  const text = JSON.stringify(tree, null, 2) + "\n";
  return {
    text,
    summary: [
      `${nodes} nodes, depth ${maxDepth}, children as array in ${arrays} nodes, as object in ${objects}`,
    ],
  };
}

// ---------------------------------------------------------------------------------------------------------
// d. fixtures/quillfeather-costs.yaml: yearly cloud spend by division, team and service.

const COSTS = [
  [
    "Software & Firmware",
    18500,
    [
      ["Fleet Telemetry", ["stream ingest", "object storage", "time-series database", "compute", "egress"]],
      ["Data Pipeline", ["batch compute", "object storage", "message queue", "data warehouse"]],
      ["Device Registry", ["managed database", "compute", "key management"]],
      ["Site Reliability", ["monitoring", "log storage", "incident paging", "backups"]],
      ["Build & Release", ["build runners", "artifact storage", "GPU compute"]],
      ["Desktop Suite", ["download hosting", "crash reports"]],
    ],
  ],
  [
    "Hardware Engineering",
    0,
    [
      ["Optics & Photonics", ["simulation compute", "file storage"]],
      ["Analog Electronics", ["simulation compute", "licence servers", "file storage"]],
    ],
  ],
  [
    "Operations",
    0,
    [
      ["Harrowgate Plant", ["line data capture", "compute", "backups"]],
      ["Lowmere Plant", ["line data capture", "compute", "backups"]],
      ["Supply Chain", ["planning database", "compute"]],
    ],
  ],
  [
    "Sales",
    0,
    [
      ["Applications Lab", ["demo environments", "video hosting"]],
      ["Pre-Sales Engineering", ["demo environments"]],
    ],
  ],
  [
    "Customer Success",
    4200,
    [["Technical Support", ["ticket archive", "remote sessions", "knowledge base"]]],
  ],
  ["Finance & Legal", 0, [["Accounting", ["ledger database", "document archive"]]]],
  ["People & Workplace", 0, [["IT Services", ["directory service", "endpoint management", "mail archive"]]]],
];

function makeCosts() {
  const r = makeRng(0xc057);
  const key = (s) => (/^[A-Za-z][A-Za-z0-9 ._()&-]*$/.test(s) && !/[ ]$/.test(s) ? s : JSON.stringify(s));
  let text =
    "# Quillfeather Instruments: yearly cloud spend by division, team and service.\n" +
    "# Invented demo data. `size` is yearly spend in whole currency units. Regenerate: npm run fixtures\n" +
    "name: Quillfeather Instruments cloud spend\n" +
    "children:\n";
  let nodes = 1;
  for (const [division, shared, teams] of COSTS) {
    nodes++;
    text += `  ${key(division)}:\n`;
    if (shared > 0) {
      text += `    size: ${shared}\n`;
      text += "    note: shared division costs\n";
    }
    text += "    children:\n";
    for (const [teamName, services] of teams) {
      nodes++;
      text += `      ${key(teamName)}:\n`;
      text += "        children:\n";
      for (const service of services) {
        nodes++;
        const spend = r.skewed(1200, 240000);
        text += `          ${key(service)}:\n            size: ${spend}\n`;
      }
    }
  }
  return { text, summary: [`${nodes} nodes`] };
}

// ---------------------------------------------------------------------------------------------------------
// e. fixtures/quillfeather-cost-export.csv: one month of a cloud cost export, one row per account, service,
// region, usage type and day (a fact table: read with --levels, rolled up by the SQL engine).

const EXPORT_ACCOUNTS = [
  ["qf-telemetry-prod", ["stream-ingest", "object-vault", "series-store", "compute-pool", "egress"]],
  ["qf-telemetry-staging", ["stream-ingest", "compute-pool"]],
  ["qf-pipeline-prod", ["batch-runner", "object-vault", "queue-relay", "warehouse"]],
  ["qf-registry-prod", ["managed-sql", "compute-pool", "key-keeper"]],
  ["qf-build", ["build-runners", "artifact-shelf"]],
  ["qf-support", ["ticket-archive", "remote-desk"]],
];
const EXPORT_REGIONS = ["harrow-north", "lowmere-east", "saltmarsh-west"];
const EXPORT_USAGE = ["hours", "storage", "requests", "transfer"];

function makeCostExport() {
  const r = makeRng(0xe4907);
  let text = "account,service,region,usage,day,cost\n";
  let rows = 0;
  for (const [account, services] of EXPORT_ACCOUNTS) {
    for (const service of services) {
      const regions = EXPORT_REGIONS.slice(0, r.int(1, 2));
      const usages = EXPORT_USAGE.filter((_, k) => k === 0 || r.chance(0.4));
      for (const region of regions) {
        for (const usage of usages) {
          const daily = r.skewed(2, 400);
          for (let day = 1; day <= 30; day++) {
            const cost = Math.max(0, daily + r.int(-Math.floor(daily / 5), Math.floor(daily / 5)));
            text += `${account},${service},${region},${usage},2031-04-${String(day).padStart(2, "0")},${cost}\n`;
            rows++;
          }
        }
      }
    }
  }
  return { text, summary: [`${rows} rows`] };
}

// ---------------------------------------------------------------------------------------------------------
// f. fixtures/tidewater-deps.edges and tidewater-packages.csv: the graph that the dependency tree unfolds.
// Each package (by name) once, with the packages it requires in order; the tree above repeats a shared
// package under every package that requires it. The records give each package's version and size.

function depsGraph() {
  const tree = JSON.parse(makeDeps().text);
  const kids = new Map();
  const info = new Map();
  const visit = (node, name) => {
    if (!info.has(name)) info.set(name, { version: node.version, size: node.size });
    if (!kids.has(name)) kids.set(name, []);
    const list = kids.get(name);
    const children = node.children ?? [];
    const pairs = Array.isArray(children)
      ? children.map((c) => [c.name, c])
      : Object.entries(children).map(([k, c]) => [k, c]);
    for (const [childName, child] of pairs) {
      if (!list.includes(childName)) list.push(childName);
      visit(child, childName);
    }
  };
  visit(tree, tree.name);
  return { kids, info };
}

function makeDepsEdges() {
  const { kids } = depsGraph();
  let edges = 0;
  let text = "";
  for (const [name, list] of kids) {
    for (const child of list) {
      text += `${name} ${child}\n`;
      edges++;
    }
  }
  return { text, summary: [`${kids.size} packages, ${edges} edges`] };
}

function makePackages() {
  const { info } = depsGraph();
  let text = "id,version,size\n";
  for (const [name, { version, size }] of info) text += `${name},${version},${size}\n`;
  return { text, summary: [`${info.size} packages`] };
}

// ---------------------------------------------------------------------------------------------------------

const jobs = [
  ["quillfeather-org.csv", makeOrg],
  ["tidewater-files.paths", makeFiles],
  ["tidewater-deps.json", makeDeps],
  ["quillfeather-costs.yaml", makeCosts],
  ["quillfeather-cost-export.csv", makeCostExport],
  ["tidewater-deps.edges", makeDepsEdges],
  ["tidewater-packages.csv", makePackages],
];
for (const [name, makeOne] of jobs) {
  const { text, summary } = makeOne();
  write(name, text);
  console.log(`fixtures/${name}: ${lineCount(text)} lines, ${Buffer.byteLength(text)} bytes`);
  for (const line of summary) console.log(`  ${line}`);
}
