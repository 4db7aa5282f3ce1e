// The invented matter behind the demo corpus: companies, people and the timeline.
// Every name, address and event here is fictional; addresses use reserved example
// domains (RFC 2606: example.com, example.net and their sub-domains).

/** One person who writes or receives documents in the matter. */
export interface Person {
  slug: string;
  name: string;
  first: string;
  title: string;
  organisation: string;
  email: string;
  /** True when the person's files are collected as a custodian. */
  custodian: boolean;
}

export const MATTER = {
  name: 'Brackenfield Bakeries v Harrowgate Mills',
  caption: 'Brackenfield Bakeries Ltd v Harrowgate Mills Ltd (fictional demo matter)',
  summary:
    'Brackenfield Bakeries ended its five-year Master Supply Agreement with Harrowgate Mills in March 2021, ' +
    'citing repeated contaminated deliveries of flour blends. Harrowgate says the termination was a pretext ' +
    'engineered with a rival mill, Ostler & Vane, which had just recruited its head of quality. Discovery ' +
    'has since turned up an off-invoice rebate scheme between the two companies, a clear-out of mill ' +
    'laboratory records after the dispute began, and a board that was kept in the dark.',
} as const;

export const HARROWGATE = 'Harrowgate Mills Ltd';
export const BRACKENFIELD = 'Brackenfield Bakeries Ltd';
export const OSTLER_VANE = 'Ostler & Vane Milling';

const hm = (local: string) => `${local}@harrowgate-mills.example.com`;
const bb = (local: string) => `${local}@brackenfield-bakeries.example.com`;

export const PEOPLE = {
  malcolm: {
    slug: 'malcolm-thorne',
    name: 'Malcolm Thorne',
    first: 'Malcolm',
    title: 'Managing Director',
    organisation: HARROWGATE,
    email: hm('malcolm.thorne'),
    custodian: true,
  },
  edwina: {
    slug: 'edwina-calloway',
    name: 'Edwina Calloway',
    first: 'Edwina',
    title: 'Sales Director',
    organisation: HARROWGATE,
    email: hm('edwina.calloway'),
    custodian: true,
  },
  rafe: {
    slug: 'rafe-dunmore',
    name: 'Rafe Dunmore',
    first: 'Rafe',
    title: 'Head of Quality Assurance',
    organisation: HARROWGATE,
    email: hm('rafe.dunmore'),
    custodian: true,
  },
  priya: {
    slug: 'priya-halvorsen',
    name: 'Priya Halvorsen',
    first: 'Priya',
    title: 'Mill Manager, Kestrel Lane',
    organisation: HARROWGATE,
    email: hm('priya.halvorsen'),
    custodian: true,
  },
  lena: {
    slug: 'lena-okafor',
    name: 'Lena Okafor',
    first: 'Lena',
    title: 'Company Secretary',
    organisation: HARROWGATE,
    email: hm('lena.okafor'),
    custodian: true,
  },
  geoffrey: {
    slug: 'geoffrey-ashby',
    name: 'Geoffrey Ashby',
    first: 'Geoffrey',
    title: 'Chairman',
    organisation: HARROWGATE,
    email: hm('geoffrey.ashby'),
    custodian: true,
  },
  simon: {
    slug: 'simon-carrow',
    name: 'Simon Carrow',
    first: 'Simon',
    title: 'Procurement Manager',
    organisation: BRACKENFIELD,
    email: bb('simon.carrow'),
    custodian: true,
  },
  hollis: {
    slug: 'hollis-wren',
    name: 'Hollis Wren',
    first: 'Hollis',
    title: 'Technical Director',
    organisation: BRACKENFIELD,
    email: bb('hollis.wren'),
    custodian: true,
  },
  daria: {
    slug: 'daria-petrakis',
    name: 'Daria Petrakis',
    first: 'Daria',
    title: 'General Counsel',
    organisation: BRACKENFIELD,
    email: bb('daria.petrakis'),
    custodian: true,
  },
  // Correspondents whose own files are not collected.
  bernard: {
    slug: 'bernard-quist',
    name: 'Bernard Quist',
    first: 'Bernard',
    title: 'Financial Controller',
    organisation: HARROWGATE,
    email: hm('bernard.quist'),
    custodian: false,
  },
  fenella: {
    slug: 'fenella-dross',
    name: 'Fenella Dross',
    first: 'Fenella',
    title: 'HR Manager',
    organisation: HARROWGATE,
    email: hm('fenella.dross'),
    custodian: false,
  },
  jed: {
    slug: 'jed-marlowe',
    name: 'Jed Marlowe',
    first: 'Jed',
    title: 'IT Support Lead',
    organisation: HARROWGATE,
    email: hm('jed.marlowe'),
    custodian: false,
  },
  corin: {
    slug: 'corin-ostler',
    name: 'Corin Ostler',
    first: 'Corin',
    title: 'Chief Executive',
    organisation: OSTLER_VANE,
    email: 'corin.ostler@ostler-vane.example.com',
    custodian: false,
  },
  nadia: {
    slug: 'nadia-fairbrook',
    name: 'Nadia Fairbrook',
    first: 'Nadia',
    title: 'Partner, Quillon Marsh LLP',
    organisation: 'Quillon Marsh LLP',
    email: 'nadia.fairbrook@quillon-marsh.example.com',
    custodian: false,
  },
  tobias: {
    slug: 'tobias-renn',
    name: 'Tobias Renn',
    first: 'Tobias',
    title: 'Laboratory Supervisor',
    organisation: HARROWGATE,
    email: hm('tobias.renn'),
    custodian: false,
  },
  orla: {
    slug: 'orla-beckett',
    name: 'Orla Beckett',
    first: 'Orla',
    title: 'Office Manager',
    organisation: HARROWGATE,
    email: hm('orla.beckett'),
    custodian: false,
  },
  marcus: {
    slug: 'marcus-lyle',
    name: 'Marcus Lyle',
    first: 'Marcus',
    title: 'Site Services Coordinator',
    organisation: BRACKENFIELD,
    email: bb('marcus.lyle'),
    custodian: false,
  },
} satisfies Record<string, Person>;

export type PersonKey = keyof typeof PEOPLE;

/** Simon Carrow's private address, used for the messages he did not want on the work system. */
export const SIMON_PRIVATE = 'sc.weekend@postbox.example.net';
/** Rafe Dunmore's private address. */
export const RAFE_PRIVATE = 'rafe.d.home@postbox.example.net';
