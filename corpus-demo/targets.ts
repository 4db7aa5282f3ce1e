// Hand-written key documents and the demo queries that should find them.
//
// Each target is worded so that it shares no Porter-stemmed key word with its demo
// query: a keyword search for the query misses it, while a concept space built from
// the whole corpus should still rank it near the top, because the corpus's other
// documents use the query's words side by side with the target's vocabulary.
// corpus.test.ts checks both claims.
import type { TopicId } from './content';
import type { PersonKey } from './scenario';
import { RAFE_PRIVATE, SIMON_PRIVATE } from './scenario';

export type TargetFormat = 'eml' | 'pdf' | 'docx' | 'txt' | 'md';

export interface TargetDocument {
  /** Path inside the corpus output folder. */
  path: string;
  custodian: PersonKey;
  format: TargetFormat;
  topics: TopicId[];
  title: string;
  date: string;
  from?: PersonKey;
  to?: (PersonKey | string)[];
  cc?: PersonKey[];
  paragraphs: string[];
}

export interface DemoQuery {
  query: string;
  topic: TopicId;
  /** Target paths a concept search should return although no key word matches. */
  expected: string[];
}

export const TARGETS: TargetDocument[] = [
  // --- destruction of records -------------------------------------------------------
  {
    path: 'priya-halvorsen/mail/2021-03-29-housekeeping-at-kestrel-lane.eml',
    custodian: 'priya',
    format: 'eml',
    topics: ['records'],
    title: 'Housekeeping at Kestrel Lane before Thursday',
    date: '2021-03-29T07:48:00Z',
    from: 'priya',
    to: ['tobias', 'jed'],
    paragraphs: [
      'Team,',
      'Before the visitors arrive on Thursday I want the QA office at Kestrel Lane properly cleared out. All the old laboratory binders for 2019 and 2020, the sifter and magnet check sheets and the moisture logger printouts are to go into the confidential waste consoles by Wednesday night. The shredding van is booked for Thursday at two.',
      'Jed will reimage the two lab laptops, QA-03 and QA-04, on Wednesday, and the weekly backup tapes can roll over early this month. Nobody needs to keep copies at home or on a memory stick.',
      'Please do this quietly and without fuss. If anyone has questions, come and see me rather than putting them in an email.',
      'Priya',
    ],
  },
  {
    path: 'priya-halvorsen/documents/2021-03-30-helpdesk-ticket-hd-20931.txt',
    custodian: 'priya',
    format: 'txt',
    topics: ['records'],
    title: 'Helpdesk ticket HD-20931',
    date: '2021-03-30T08:12:00Z',
    paragraphs: [
      'HELPDESK TICKET HD-20931',
      'Opened: 30/03/2021 08:12\nRequester: Priya Halvorsen, Mill Manager, Kestrel Lane\nAssigned: Jed Marlowe, IT Support\nCategory: Hardware / reimage',
      'Summary: Wipe and reimage laptops QA-03 and QA-04; bring forward overwrite of the weekly backup tapes.',
      'Details: Requester asks that both laboratory laptops are wiped and rebuilt from the standard image before Thursday, and that the tape rotation is brought forward so that the March backup tapes are overwritten this week. Reason given: "spring clean before the visitors".',
      'Approval: verbal, P. Halvorsen. Legal hold check: not performed.',
      'Status: Closed 01/04/2021 16:40. Both devices reimaged. Tapes overwritten.',
    ],
  },
  {
    path: 'priya-halvorsen/documents/2021-04-01-certificate-of-secure-disposal.pdf',
    custodian: 'priya',
    format: 'pdf',
    topics: ['records'],
    title: 'Pennock Secure Waste: certificate of secure disposal',
    date: '2021-04-01T15:30:00Z',
    paragraphs: [
      'Customer: Harrowgate Mills Ltd, Kestrel Lane mill, QA office. Booked by: P. Halvorsen. Collection date: 1 April 2021, 14:05.',
      'Items collected: fourteen sealed confidential waste consoles containing laboratory binders, sifter and magnet check sheets and logger printouts, as declared by the customer.',
      "Method: shredded on site in the customer's presence; cross-cut particles to security level P-4; shredded material baled for pulping.",
      "This collection was made outside the customer's regular monthly schedule at the customer's request. Driver: K. Amberley. Vehicle: mobile shredding unit 3.",
    ],
  },
  // --- rebates / kickbacks ----------------------------------------------------------
  {
    path: 'edwina-calloway/mail/2020-10-05-sheaf-q3.eml',
    custodian: 'edwina',
    format: 'eml',
    topics: ['rebates'],
    title: 'Sheaf: Q3',
    date: '2020-10-05T18:22:00Z',
    from: 'edwina',
    to: [SIMON_PRIVATE],
    paragraphs: [
      'Simon,',
      'Q3 went across on Friday through Wendle, same route as last time: £18,400, described as a consultancy fee for market insight. Nothing on our invoices to Brackenfield and nothing in the contract file.',
      'The boat is at the marina for the August bank holiday next year as well if you want it; keys at the marina office as before.',
      "Delete this once you've read it.",
      'E.',
    ],
  },
  {
    path: 'edwina-calloway/documents/2020-10-01-wendle-advisory-invoice-wa-0012.pdf',
    custodian: 'edwina',
    format: 'pdf',
    topics: ['rebates'],
    title: 'Wendle Advisory Ltd: invoice WA-0012',
    date: '2020-10-01T09:00:00Z',
    paragraphs: [
      'To: Harrowgate Mills Ltd, for the attention of the Sales Director. Invoice number WA-0012. Invoice date: 1 October 2020.',
      'For: market insight consultancy services, quarter three 2020, as agreed. Fee: £18,400. VAT: not registered.',
      'Settlement by bank transfer within seven days to the Wendle Advisory account. With thanks for your continued business.',
    ],
  },
  {
    path: 'edwina-calloway/documents/2021-01-08-sheaf-ledger.md',
    custodian: 'edwina',
    format: 'md',
    topics: ['rebates'],
    title: 'Sheaf',
    date: '2021-01-08T12:00:00Z',
    paragraphs: [
      '| Quarter | Loyalty credit | Route |\n|---|---|---|\n| Q1 2020 | £11,250 | Wendle |\n| Q2 2020 | £14,900 | Wendle |\n| Q3 2020 | £18,400 | Wendle |\n| Q4 2020 | £16,750 | Wendle |',
      'Loyalty credit: one and a half per cent of invoiced value, off-invoice. Settle through Wendle as consultancy, never by credit note.',
      'Only E.C., S.C. and M.T. to know. Nothing to Bernard beyond the Wendle invoice.',
    ],
  },
  // --- recruitment / poaching -------------------------------------------------------
  {
    path: 'rafe-dunmore/mail/2021-01-21-a-conversation-worth-having.eml',
    custodian: 'rafe',
    format: 'eml',
    topics: ['recruitment'],
    title: 'A conversation worth having',
    date: '2021-01-21T20:05:00Z',
    from: 'corin',
    to: [RAFE_PRIVATE],
    paragraphs: [
      'Rafe,',
      'Good to sit down properly at last. As promised, in writing: Head of Technical at Ostler & Vane, a base of £98,000, a golden hello of £20,000 and the car. We will cover you for any garden leave your present employer insists on.',
      'If Mina and Tobias from your laboratory wanted to come across with you, we would find roles for both of them, and for anyone else you rate. Ideally you would all start by May, which is when the new bakery volume begins.',
      'Corin',
    ],
  },
  {
    path: 'rafe-dunmore/documents/2021-02-11-resignation-letter.docx',
    custodian: 'rafe',
    format: 'docx',
    topics: ['recruitment'],
    title: 'Resignation',
    date: '2021-02-11T09:00:00Z',
    paragraphs: [
      'Dear Malcolm,',
      'Please accept this letter as formal notice of my resignation as Head of Quality Assurance. I have accepted a technical role with another company in the milling sector and understand that my notice period under my contract is three months.',
      'I expect the company may wish me to spend my notice on garden leave. I will of course return my laptop, phone and security pass, and I will hand over the laboratory to Tobias in an orderly way.',
      'Thank you for the opportunities of the last nine years.',
      'Yours sincerely,\nRafe Dunmore',
    ],
  },
  {
    path: 'rafe-dunmore/documents/2021-03-04-exit-interview-m-sorrell.txt',
    custodian: 'rafe',
    format: 'txt',
    topics: ['recruitment'],
    title: 'Exit interview: M. Sorrell, laboratory analyst',
    date: '2021-03-04T14:00:00Z',
    paragraphs: [
      'EXIT INTERVIEW NOTE (copied to R. Dunmore at his request before his garden leave began)',
      'Leaver: Mina Sorrell, Laboratory Analyst, Kestrel Lane. Interviewer: Fenella Dross, HR.',
      'Reason for leaving: offered a post at Ostler & Vane after a headhunter telephoned her at home in January. Salary eighteen per cent higher, plus a signing bonus.',
      'Mina said that Rafe had told several of the lab team over Christmas drinks that "there is room for all of us over there" and that Tobias had also been sounded out. She starts at Ostler & Vane on 3 May.',
    ],
  },
  // --- contaminated flour -----------------------------------------------------------
  {
    path: 'hollis-wren/documents/2020-11-17-ncr-2020-117.pdf',
    custodian: 'hollis',
    format: 'pdf',
    topics: ['quality'],
    title: 'Non-conformance report NCR-2020-117',
    date: '2020-11-17T11:00:00Z',
    paragraphs: [
      'Site: Dunsford bakery, intake bay 2. Supplier: Harrowgate Mills Ltd, Kestrel Lane. Product: wholemeal blend, lot HM-4471, 22 tonnes in bulk tanker.',
      'Findings: sieve residue contained insect fragments and two live weevils. The intake magnet recovered fine metal swarf. Moisture measured at 15.8 per cent against a specification maximum of 14.5 per cent; musty odour noted.',
      "Disposition: load rejected at the gate, quarantined and returned to the supplier at the supplier's cost. Retained sample held in the Dunsford laboratory.",
      'History: the third rejection of this blend in eight weeks. Earlier lots left black specks in the crumb on line 3 and drew a foreign-body complaint on the careline. Supplier asked to quarantine every lot milled at Kestrel Lane in the same fortnight.',
      'Raised by: Hollis Wren, Technical Director. Supplier notified: 17 November 2020, 11:40.',
    ],
  },
  {
    path: 'hollis-wren/documents/2020-12-02-night-shift-log-line-3.txt',
    custodian: 'hollis',
    format: 'txt',
    topics: ['quality'],
    title: 'Dunsford bakery: night shift log, line 3',
    date: '2020-12-02T05:30:00Z',
    paragraphs: [
      'DUNSFORD BAKERY: NIGHT SHIFT LOG, LINE 3, 1-2 DECEMBER 2020',
      '02:40 Dough from silo 2 showing black specks through the crumb. Line stopped. 1,100 loaves binned.',
      '03:10 Mixers stripped and cleaned. Divider and moulder checked, nothing found.',
      '04:15 Engineer found the silo 2 intake filter clogged with grit and what look like insect casings. Silo 2 was filled from the Harrowgate tanker on Tuesday.',
      '05:30 Handed over to day shift. Samples bagged and labelled for Hollis.',
    ],
  },
  {
    path: 'hollis-wren/mail/2021-01-18-customer-complaint-wire-in-bloomer.eml',
    custodian: 'hollis',
    format: 'eml',
    topics: ['quality'],
    title: 'Customer complaint: wire in a farmhouse bloomer',
    date: '2021-01-18T10:14:00Z',
    from: 'marcus',
    to: ['hollis'],
    paragraphs: [
      'Hollis,',
      'A customer from Ashworth rang the careline this morning to say her daughter bit on a piece of thin wire in a slice of our farmhouse bloomer, bought on Saturday. We have the loaf, the bag, the best-before date and the batch code.',
      'This is the third foreign-body complaint this month linked to the same Harrowgate intake week. I have logged it and told the store.',
      'Marcus',
    ],
  },
  // --- board-level concealment ------------------------------------------------------
  {
    path: 'geoffrey-ashby/mail/2021-04-19-thursday.eml',
    custodian: 'geoffrey',
    format: 'eml',
    topics: ['concealment'],
    title: 'Thursday',
    date: '2021-04-19T21:37:00Z',
    from: 'geoffrey',
    to: ['malcolm'],
    paragraphs: [
      'Malcolm,',
      "On Dunsford: verbal update only on Thursday, nothing in the papers, and I'd rather it stayed off the minutes altogether. The non-executives can be brought up to speed once we know the size of the hole, and the same goes for the auditors.",
      'No point spooking the insurers a fortnight before renewal either.',
      'Geoffrey',
    ],
  },
  {
    path: 'lena-okafor/mail/2021-04-23-draft-minutes-item-9.eml',
    custodian: 'lena',
    format: 'eml',
    topics: ['concealment'],
    title: 'Draft minutes: item 9',
    date: '2021-04-23T16:02:00Z',
    from: 'lena',
    to: ['malcolm'],
    paragraphs: [
      'Malcolm,',
      "As asked, I have taken item 9 (Brackenfield) out of the draft minutes before circulation, so the trading update now reads 'in line with budget'.",
      "I should say that I am uncomfortable altering an account of what the directors discussed after it was agreed in the room, and I would like the Chairman's instruction in writing.",
      'Lena',
    ],
  },
  {
    path: 'malcolm-thorne/documents/2021-04-21-notes-for-thursday.md',
    custodian: 'malcolm',
    format: 'md',
    topics: ['concealment', 'rebates'],
    title: 'Notes for Thursday',
    date: '2021-04-21T07:15:00Z',
    paragraphs: [
      '- Trading: in line with budget. Say no more.\n- Dunsford and the NCR tally: NOT in the pack. Oral only if asked, and not minuted.\n- Wendle: if the auditors raise it, marketing consultancy.\n- Insurance: renewal form goes in before the 30th; answer "no" to known circumstances.\n- Non-execs: G.A. to handle.',
    ],
  },
];

export const DEMO_QUERIES: DemoQuery[] = [
  {
    query: 'destruction of records',
    topic: 'records',
    expected: [
      'priya-halvorsen/mail/2021-03-29-housekeeping-at-kestrel-lane.eml',
      'priya-halvorsen/documents/2021-03-30-helpdesk-ticket-hd-20931.txt',
      'priya-halvorsen/documents/2021-04-01-certificate-of-secure-disposal.pdf',
    ],
  },
  {
    query: 'kickbacks to the buyer',
    topic: 'rebates',
    expected: [
      'edwina-calloway/mail/2020-10-05-sheaf-q3.eml',
      'edwina-calloway/documents/2020-10-01-wendle-advisory-invoice-wa-0012.pdf',
      'edwina-calloway/documents/2021-01-08-sheaf-ledger.md',
    ],
  },
  {
    query: 'poaching our staff',
    topic: 'recruitment',
    expected: [
      'rafe-dunmore/mail/2021-01-21-a-conversation-worth-having.eml',
      'rafe-dunmore/documents/2021-02-11-resignation-letter.docx',
      'rafe-dunmore/documents/2021-03-04-exit-interview-m-sorrell.txt',
    ],
  },
  {
    query: 'contaminated flour',
    topic: 'quality',
    expected: [
      'hollis-wren/documents/2020-11-17-ncr-2020-117.pdf',
      'hollis-wren/documents/2020-12-02-night-shift-log-line-3.txt',
      'hollis-wren/mail/2021-01-18-customer-complaint-wire-in-bloomer.eml',
    ],
  },
  {
    query: 'hiding problems from the board',
    topic: 'concealment',
    expected: [
      'geoffrey-ashby/mail/2021-04-19-thursday.eml',
      'lena-okafor/mail/2021-04-23-draft-minutes-item-9.eml',
      'malcolm-thorne/documents/2021-04-21-notes-for-thursday.md',
    ],
  },
];
