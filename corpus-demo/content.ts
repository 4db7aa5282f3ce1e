// Paragraph templates for the demo corpus, written for this invented matter.
//
// Syntax: `[a|b|c]` picks one alternative; `{slot}` is filled from the document's
// context (see fillTemplate in generate.ts). Each topic is written in two registers,
// formal (memos, letters, reports) and chatty (e-mails between colleagues), and
// deliberately mixes plain words with euphemisms and code names, so that documents
// about the same thing often share no key word. A few paragraphs per topic bridge
// the plain and the coded vocabulary; that co-occurrence is what lets a concept
// space (Deerwester et al. 1990) connect them.

export type TopicId =
  'termination' | 'quality' | 'rebates' | 'recruitment' | 'records' | 'concealment';

export interface TopicContent {
  id: TopicId;
  label: string;
  description: string;
  subjects: string[];
  formal: string[];
  chatty: string[];
  /** Paragraphs that name the thing plainly and in code at once (analyses, candid e-mails). */
  bridgeFormal: string[];
  bridgeChatty: string[];
}

export const TOPICS: TopicContent[] = [
  {
    id: 'termination',
    label: 'Termination of the supply agreement',
    description:
      'Brackenfield ends the 2017 Master Supply Agreement early; notices, cure periods, wind-down volumes and the fight over whether the breach was real.',
    subjects: [
      'Master Supply Agreement: notice under clause 14.2',
      'MSA exit options',
      'Wind-down of Harrowgate volumes',
      'Cure period and next steps',
      'Re: the contract',
      'Transition plan for flour supply',
      'Without prejudice: proposed orderly exit',
      'Notice of termination',
    ],
    formal: [
      'We refer to the Master Supply Agreement dated 1 March 2017 between {bb} and {hm} (the "Agreement"). [Pursuant to|In accordance with|Under] clause 14.2, we hereby give notice that the Agreement will terminate with effect from 30 April 2021 on the grounds of material breach.',
      'The repeated failure of deliveries to meet the Specification set out in Schedule 2 constitutes a material breach which has not been remedied within the thirty-day cure period. [We reserve all rights|All of our rights and remedies are expressly reserved], including the right to recover the costs of replacement supply.',
      'For the avoidance of doubt, we do not accept that any breach has occurred. The non-conformances raised by your technical team were closed out within the cure period and the purported notice of termination is, in our view, invalid and of no effect.',
      'Schedule 4 requires the parties to agree an orderly wind-down. We propose that call-off volumes reduce to sixty per cent in April and cease after the final delivery to the {site} intake on 28 April, with outstanding invoices settled in the usual way.',
      'The Board is asked to note that the early termination of the Brackenfield contract removes roughly a third of Kestrel Lane throughput and that the [minimum purchase commitment|take-or-pay undertaking] in clause 6 will fall away on exit.',
      'Our position is that {bb} was entitled to bring the Agreement to an end. Whether the right was exercised for the stated reason, or as a pretext for moving volume to another mill, is likely to be the central question if the matter proceeds.',
      'Please treat this letter as a letter before claim. If the notice of termination is not withdrawn within fourteen days we are instructed to issue proceedings for damages for wrongful repudiation, including loss of profit for the unexpired term.',
      'The termination clause permits either party to end the Agreement on twelve months notice without cause, or immediately for material breach that is not cured. The shorter route is only available if the breach is genuine and properly documented.',
      'A transition plan has been prepared so that bakery production is not interrupted when the current supply arrangement ends. Replacement volumes have been [secured|lined up|provisionally agreed] from an alternative miller from May onwards.',
      'We note that your client has already placed trial orders with another supplier, dated some weeks before the notice was served. That sequence of events is difficult to reconcile with a termination said to have been forced by quality failures.',
    ],
    chatty: [
      "{to}, straight answer: yes, we can walk away from the contract, but only if the breach point holds up. If it doesn't, we're the ones in breach. Can we talk before anything goes out?",
      'Legal are happy with the notice wording. It goes out {weekday} by courier and email. After that the clock starts on the wind-down and we stop taking new call-offs from Harrowgate.',
      "So that's it then, they've pulled the plug. Twelve years of supplying Brackenfield and they end it with a two-page letter. {to}, I need the contract file on my desk this afternoon.",
      'I [still|honestly] think the exit is premature. Get the cure period done properly, let them fix it or fail, and then terminate if we have to. Going early makes it look like we had somewhere else to go.',
      "Heads up, the termination notice has landed. Don't reply to anything from Brackenfield on this, send it all to me and I'll loop in the lawyers.",
      'Quick one on the wind-down: their last delivery slot is the 28th. After that the {site} intake is closed to Harrowgate trucks. Can you make sure the gatehouse knows?',
      'Between us, the quality stuff is real but it is also convenient. The decision to end the deal was made well before the last batch of complaints. I would not want to be asked about the dates under oath.',
      'Ending the arrangement early costs us the volume rebate for the year, so finance will want to know why. Have a think about how we explain the exit before the budget review.',
    ],
    bridgeFormal: [
      'The termination of the supply agreement was served under clause 14.2 for material breach, but the trial orders placed with Ostler & Vane, the wind-down schedule and the transition plan were all drafted before the cure period expired.',
      'Whether Brackenfield could walk away from the Master Supply Agreement depends on the cure period: if the non-conformances were remedied within thirty days, the notice of termination was premature and amounts to a repudiation.',
    ],
    bridgeChatty: [
      'The exit was planned long before the notice, {to}. Trial orders with another mill, a wind-down schedule, the lot. Terminating the agreement for breach was the tidy way out.',
      "Pulling the plug on Harrowgate under 14.2 only works if the breach is real. Otherwise we've ended the supply agreement without a right to, and they'll sue for the lost years.",
    ],
  },
  {
    id: 'quality',
    label: 'Product defects and quality complaints',
    description:
      'Contaminated and off-specification flour blends delivered to the Dunsford bakery: foreign matter, insects, moisture and mould, non-conformance reports and rejected loads.',
    subjects: [
      'NCR {ncr}: rejected load, lot {lot}',
      'Another rejection at {site}',
      'Foreign matter in wholemeal blend',
      'Moisture results for lot {lot}',
      'Customer complaint: bloomer loaf',
      'Intake sieve findings',
      'Quality failures: summary for October',
      'Re: contaminated flour',
    ],
    formal: [
      'Non-conformance report {ncr}. On receipt at the {site} intake, {tonnes} tonnes of the wholemeal blend, lot {lot}, were rejected. Sieve residue contained insect fragments and two live weevils; the intake magnet recovered fine metal swarf. The load was quarantined and returned to the supplier.',
      'Moisture content of lot {lot} was measured at 15.8 per cent against a specification maximum of 14.5 per cent. Elevated moisture of this order is associated with mould growth in storage and accounts for the musty odour reported by the night shift.',
      'This is the {count} contaminated flour delivery this quarter. The pattern points to a systemic failure in cleaning and sifting at the Kestrel Lane mill rather than an isolated incident, and we require a full root-cause analysis within ten working days.',
      'The supplier audit found the plansifter screens worn through in two places, magnets not cleaned to schedule, and pest-control bait points overdue for inspection. Each finding is capable of explaining the foreign bodies and infestation found in delivered product.',
      'Complaints from retail customers have risen sharply. Since September we have logged reports of grit, black specks and, in one case, a length of wire in a finished loaf. Every complaint has been traced to flour from Harrowgate lots received in the same fortnight.',
      'Corrective action: the mill will replace sifter screens, increase magnet checks to every shift and hold each lot until laboratory release. The Head of Quality Assurance will report weekly on rejected loads and open non-conformances.',
      'The laboratory retains samples of every lot for twelve months. Retained samples for lots {lot} and the two adjacent lots should be tested independently so that the contamination findings can be confirmed or rebutted.',
      'Off-specification product must not be reworked into other blends. Any lot that fails the intake tests is to be rejected and its disposal logged, so that no defective flour re-enters the supply chain.',
      'Food safety risk assessment: the presence of metal fragments in a milled ingredient is a critical hazard. A product recall would be required if affected loaves reached the shelf, and the bakery has placed all Harrowgate lots on positive release.',
    ],
    chatty: [
      "{to}, it's happened again. Another truck of the wholemeal blend turned away at {site} this morning, bugs in the sieve and the magnet covered in filings. That's the third this month.",
      'Night shift say the dough on line 3 was full of black specks, so they binned the run and stripped the mixers. Can someone at Harrowgate explain what is going on at that mill?',
      'Honestly the flour quality has gone off a cliff since the summer. Rejected loads, damp sacks, that smell. If it carries on we will have to stop taking their product altogether.',
      'Results are back for lot {lot}: moisture high, insect fragments in the residue. I have raised NCR {ncr} and copied Rafe. Please do not put it into production.',
      'We had a customer ring in about a bit of wire in a bloomer. Wire! I have kept the loaf and the packaging. If that had been a child we would be on the front page.',
      'The sifters at Kestrel Lane are knackered, {to}. I told Priya in August. Screens are torn, the magnets never get cleaned on nights and the pest contractor has not been in for weeks.',
      'Can you pull together every complaint and rejection since September into one table? Dates, lots, what was found. The lawyers will ask for it and I would rather we had it first.',
      "Between you and me, some of those loads were borderline and we let them through because we were short. I'd rather that didn't come out if they push back on the contamination numbers.",
    ],
    bridgeFormal: [
      'Contaminated flour reached the Dunsford bakery in three ways: tanker loads with insect fragments, weevils and metal swarf in the sieve residue; silo product that left black specks in the crumb on line 3; and finished loaves that drew foreign-body complaints on the careline.',
      'Each contaminated flour delivery is documented twice: once in a non-conformance report at the intake, with the sieve residue and magnet findings, and again in the night shift log when dough from the silo has to be binned and the mixers stripped.',
      'The wholemeal blend lots behind the customer complaints, a piece of wire in a farmhouse bloomer among them, were all flour milled at Kestrel Lane in the same fortnight; retained samples of each lot show the same contamination.',
    ],
    bridgeChatty: [
      'More contaminated flour, {to}. Night shift binned a whole run on line 3 for black specks, the silo filter was full of grit and insect casings, and the careline has another wire-in-a-bloomer complaint.',
      "If the flour is contaminated at the mill, the weevils and swarf end up in the tanker, then the silo, then in somebody's farmhouse bloomer. That's why I keep rejecting loads at the gate.",
    ],
  },
  {
    id: 'rebates',
    label: 'Pricing and rebate side deals',
    description:
      "An off-invoice 'loyalty credit' paid to Brackenfield's procurement manager through a consultancy, Wendle Advisory, under the code name Sheaf.",
    subjects: [
      'Sheaf',
      'Q{q} loyalty credit',
      'Wendle Advisory: consultancy invoice',
      'Pricing for the 2020 contract year',
      'Re: rebate accrual',
      'Volume rebate reconciliation',
      'Hospitality: August',
      'Re: the arrangement',
    ],
    formal: [
      'The volume rebate under Schedule 3 of the Agreement is paid annually as a credit note against invoices and is disclosed in both companies accounts. No other rebate, discount or payment to the customer or its employees is authorised.',
      'Internal audit has identified quarterly payments of between eleven and nineteen thousand pounds to Wendle Advisory Ltd, described as consultancy fees for market insight. No engagement letter, report or deliverable could be located for any of the payments.',
      'Wendle Advisory Ltd was incorporated in 2018. Its sole director and shareholder is the spouse of the purchasing manager at {bb}. The payments therefore appear to be kickbacks to the buyer, disguised as consultancy, in return for volume and favourable contract terms.',
      'Sales have approved a retrospective discount of two per cent, applied off-invoice and booked to marketing support. The discount is not reflected in the Agreement or in any side letter signed by both parties.',
      "The so-called Sheaf payments were coded to sundry marketing and approved by the Sales Director alone. They are, in substance, secret commissions paid to the customer's buyer, and may amount to bribery for the purposes of the relevant legislation.",
      'Corporate hospitality for the purchasing team in 2020 included the use of a motor cruiser for a week in August, two rugby debenture seats and a hotel stay. None of it was entered in the gifts and hospitality register.',
      "Pricing for contract year four is held at £{price} per tonne for the premium blends, with the loyalty credit calculated at one and a half per cent of the quarter's invoiced value and settled through the usual route.",
      'The rebate accrual does not reconcile. The ledger shows credits of £{amount} that do not correspond to any customer credit note, and the supporting schedule refers only to "S. – Q{q}".',
    ],
    chatty: [
      "Sheaf for Q{q} went across on Friday, same route as before. £{amount}. Nothing on the invoices, nothing in the contract file. Delete this once you've read it, there's a good chap.",
      "Simon's been asking when the next loyalty credit lands. I've told him end of the month. Can you make sure Bernard pushes the Wendle invoice through without asking questions?",
      'The boat is yours for the August bank holiday, {to}. Keys at the marina office. Consider it a thank-you for keeping our volumes where they are.',
      "Look, everyone in this trade does off-invoice deals. It's not a kickback, it's relationship money. But I agree we shouldn't write any more about it.",
      "If the buyer is getting a cut through his wife's company then we have a much bigger problem than a bit of mouldy flour. Who else knows about Wendle?",
      'Bernard flagged the Wendle payments again. I told him they were consultancy and to leave it with me. He is not convinced and he is writing things down.',
      "Pricing's agreed at £{price}, and the usual credit on top once the quarter closes. Let's keep the side arrangement between the three of us.",
      'The auditors have picked up the marketing support line. Two hundred grand over three years and no invoices from anyone but Wendle. I need an answer before Thursday.',
    ],
    bridgeFormal: [
      'The Sheaf scheme paid kickbacks to the buyer each quarter: a loyalty credit of one and a half per cent of invoiced value, routed through Wendle Advisory as a consultancy fee for market insight and never shown on a credit note.',
      "Wendle Advisory's invoices describe market insight consultancy services for each quarter. They are the paper trail of the kickbacks: the fees match the Sheaf loyalty credit to the pound, are paid by bank transfer within seven days, and Wendle is not VAT registered.",
      'Hospitality for the buyer, including the motor cruiser at the marina over the August bank holiday, was part of the same arrangement as the Sheaf kickbacks and was likewise kept out of the contract file.',
    ],
    bridgeChatty: [
      "Call it Sheaf, call it a loyalty credit, call it consultancy through Wendle: it's a kickback to their buyer and we both know it. The boat at the marina doesn't help.",
      'Bernard says the Wendle invoices come in every quarter, same fee as the Sheaf credit, paid within seven days. If those are kickbacks to the buyer we are all in trouble.',
    ],
  },
  {
    id: 'recruitment',
    label: "A rival's recruitment of staff",
    description:
      "Ostler & Vane, a competing mill, recruits Harrowgate's head of quality and approaches his laboratory team while the Brackenfield volume is moving across.",
    subjects: [
      'A conversation worth having',
      'Resignation',
      'Restrictive covenants: R. Dunmore',
      'Ostler & Vane approach',
      'Lab team retention',
      'Re: your new role',
      'Garden leave and return of property',
      'Confidential: headcount risk',
    ],
    formal: [
      'We have learned that Ostler & Vane Milling has approached several members of the Kestrel Lane laboratory. Poaching of key staff by a direct competitor, at the very moment our largest customer is in dispute with us, cannot be a coincidence.',
      "Mr Dunmore's contract contains a six-month non-compete, a twelve-month non-solicitation covenant covering customers and staff, and a confidentiality obligation that survives termination of employment. We intend to enforce each of them.",
      'Please confirm by return that Mr Dunmore has not solicited, and will not solicit, any employee of {hm} to join Ostler & Vane, and that he has returned all documents, specifications and devices belonging to the company.',
      'Our client is entitled to recruit in an open market. Mr Dunmore answered an advertised vacancy; no employee was induced to breach a contract, and our client has no interest in any confidential information belonging to his former employer.',
      'Retention measures for the laboratory: a one-off retention payment of ten per cent of salary for supervisors and analysts remaining in post on 30 September, and a review of grading. Exit interviews indicate that a competitor has been poaching staff with offers well above market.',
      'Mr Dunmore will be placed on garden leave for the whole of his notice period. He is not to attend site, contact customers or suppliers, or access company systems, and his laptop and phone must be returned to IT on his last day.',
      "A forensic review of Mr Dunmore's laptop shows that on 9 February he copied the customer specification folder, including the Brackenfield intake tolerances, to a personal USB drive two days before tendering his resignation.",
      'The headhunter engaged by Ostler & Vane contacted at least four members of staff in January. The recruitment campaign targeted precisely the people who understand the Brackenfield specification and intake arrangements.',
    ],
    chatty: [
      "{to}, Rafe has just resigned. He's going to Ostler & Vane, of all places. And I hear they've been sniffing round Tobias and Mina as well. They're poaching the whole lab.",
      "Had a call from a headhunter today asking if I was 'open to a conversation' about a technical role at another mill. Thought you should know. I said no, for now.",
      "They're offering him a fortune, apparently. Head of Technical, big package, car. Hard to compete with that when we've frozen pay for two years.",
      'Can we get Fenella to look at the covenants in his contract? If he takes any of our staff with him I want to be able to stop it quickly.',
      'Word on the floor is that Ostler & Vane will take anyone from our QA team who can start by May. Same month Brackenfield moves across. Work that one out.',
      "I've told the lab supervisors that nobody is leaving on my watch without a conversation with me first. But morale is on the floor since Rafe went.",
      'IT say his laptop shows a big copy to a USB stick the week before he resigned. The spec folder, all the customer files. We need to get lawyers on this today.',
    ],
    bridgeFormal: [
      "Ostler & Vane's poaching of our staff followed a pattern: a headhunter's call, a golden hello or signing bonus, a technical role at a higher salary, and a promise to cover any garden leave. Mina Sorrell and Tobias Renn were both sounded out after Rafe Dunmore's resignation.",
      "Exit interviews with laboratory leavers show that the poaching of staff was coordinated: each was approached by the same headhunter, offered a salary well above ours and told there was 'room for all of us' at Ostler & Vane.",
      'The poaching of laboratory staff matters to the contract claim: the head of quality, his analysts and their knowledge of the Brackenfield specification moved to Ostler & Vane in the same month as the bakery volume.',
    ],
    bridgeChatty: [
      "They're poaching our staff one by one, {to}. First Rafe as Head of Technical, now Mina, and Tobias has been sounded out. Golden hellos all round and they'll pay for the garden leave.",
      "Rafe's resignation letter says 'another company in the milling sector'. Everyone knows it's Ostler & Vane, and that the poaching of our lab staff started with him.",
    ],
  },
  {
    id: 'records',
    label: 'Destruction of records',
    description:
      'After the letter before claim, Kestrel Lane laboratory binders, logger data and laptop contents are cleared away despite a litigation hold.',
    subjects: [
      'Litigation hold: Brackenfield dispute',
      'Document retention reminder',
      'Housekeeping at Kestrel Lane',
      'Re: shredding',
      'Backup tapes',
      'Preservation of records',
      'QA cabinet',
      'Spring clean',
    ],
    formal: [
      'LITIGATION HOLD. Because of the dispute with {bb}, you must preserve all records, documents and data, paper or electronic, that relate to the Agreement, deliveries, quality testing or the customer. Do not delete, destroy, shred, overwrite or alter any of them until legal tells you in writing that the hold is lifted.',
      'The hold overrides the ordinary retention schedule. Laboratory binders, moisture logger data, sifter and magnet check sheets, emails and laptop contents must be kept even where the schedule would otherwise allow their destruction.',
      'It has come to our attention that laboratory records from Kestrel Lane were destroyed in late March, after the letter before claim was received. The destruction of relevant documents after litigation was contemplated is a serious matter and may lead the court to draw adverse inferences.',
      'Confidential waste collection note: fourteen sealed consoles collected from the Kestrel Lane QA office and shredded on site. The collection was booked by the mill manager outside the usual monthly schedule.',
      'IT change request: reimage laptops QA-03 and QA-04 and bring forward the overwrite of the weekly backup tapes. Requested as routine housekeeping. Approval was given verbally; no reference to the litigation hold appears on the ticket.',
      "Our client's document retention policy provides for the destruction of quality records after two years. The relevant binders were within that period and, in any event, were subject to a preservation notice issued on 19 March.",
      'We require a witness statement explaining who ordered the purge of the QA shared drive and the clear-out of the laboratory cabinet, on what date, and whether the persons concerned had received the litigation hold.',
      "Records management: paper records are to be boxed, labelled and sent to the off-site archive rather than shredded, and no email account is to be deleted on a leaver's departure while a hold is in force.",
    ],
    chatty: [
      "Before the auditors come, let's have a proper clear-out of the QA office. Old binders in the confidential waste, loggers wiped, the lot. We don't need to be keeping every scrap from 2019.",
      "{to}, the shredding van is booked for Thursday afternoon. Can you make sure the cabinet in the lab is emptied into the consoles before then? Don't make a big thing of it.",
      "Did you get the legal hold email? I'm confused, Priya told us yesterday to bin the old test sheets. Which one do I follow?",
      'Jed, please reimage the two lab laptops and let the backup tapes roll over early. Just housekeeping. No need to raise a formal ticket.',
      "I'm not comfortable with this. We've been told to keep everything and now we're being told to get rid of the records. If anyone asks I'm not lying about it.",
      'Shared drive is a mess, half of it is old QA stuff from before Rafe left. I had a purge this morning, deleted the 2019 and 2020 folders. Much tidier now.',
      'Is there any way to get the deleted QA folders back? Legal are asking for the 2020 sifter check sheets and I think they went in the clear-out.',
    ],
    bridgeFormal: [
      'The destruction of records at Kestrel Lane took three forms: laboratory binders and check sheets put into confidential waste consoles and shredded on site by Pennock Secure Waste; the two QA laptops wiped and reimaged; and the weekly backup tapes overwritten early.',
      "Pennock Secure Waste's certificate of secure disposal confirms that fourteen consoles of records were shredded on site on 1 April. The helpdesk ticket for reimaging the laptops and overwriting the backup tapes gives 'spring clean' as the reason for what was, in substance, the destruction of records.",
      'The mill manager described the destruction of records as housekeeping before the visitors arrived. The visitors were the forensic team instructed to collect the logger printouts, sifter and magnet check sheets and laboratory binders.',
    ],
    bridgeChatty: [
      "So 'housekeeping' meant destroying the records. Binders into the shredding van, laptops reimaged, backup tapes overwritten. And the visitors she mentioned were our own lawyers.",
      'The destruction of the lab records was no accident, {to}. Somebody booked the shredding van, raised a helpdesk ticket to wipe the laptops and asked for the backup tapes to roll over early, all in the same week.',
    ],
  },
  {
    id: 'concealment',
    label: 'Board-level concealment',
    description:
      "Harrowgate's chairman and managing director keep the rejection numbers, the rebate scheme and the litigation risk away from the full board, the auditors and the insurers.",
    subjects: [
      'Thursday board',
      'Board papers: April',
      'Draft minutes for approval',
      'Re: what the non-execs see',
      'Insurance renewal',
      'AOB',
      'Private and confidential',
      'Re: audit questions',
    ],
    formal: [
      'Minutes of the meeting of the Board of Directors of {hm}. Item 7, trading update: the Managing Director reported that trading was in line with budget. No reference was made to the rejected deliveries or to the notice of termination received on 15 March.',
      'The non-executive directors were not told of the Brackenfield rejections, the notice of termination or the internal audit findings before the April meeting. Information of this kind should have been placed before the full board.',
      'Hiding known problems from the board, the auditors or the insurers exposes the directors personally. A director who conceals a material risk from his colleagues is unlikely to have acted in good faith in the interests of the company.',
      'The draft minutes circulated on 23 April included a discussion of the Brackenfield dispute under item 9. The approved minutes omit that item entirely. The Company Secretary has been asked to explain the change and on whose instruction it was made.',
      'The insurance proposal form for the product liability renewal answered "no" to the question whether the company was aware of any circumstance likely to give rise to a claim. At that date the company held at least eleven open non-conformance reports.',
      "The auditors have asked whether any matters were discussed by directors outside formal board meetings that should have been disclosed. A full and accurate answer will require the Chairman's private correspondence with the Managing Director.",
      'Governance review: papers for the board must contain the information the directors need, including bad news. Oral updates "not to be minuted" are not a substitute for written disclosure of material risks.',
    ],
    chatty: [
      "Malcolm, let's not frighten the horses. Verbal update only on Thursday and I'd rather the detail stayed off the minutes. We can bring the board up to speed once we know the size of the problem.",
      "Lena, please take item 9 out of the draft minutes. The Chairman doesn't want it in there. Just say trading in line with budget.",
      "The non-execs will go spare if they see the NCR tally. Keep it out of the pack for now, we'll deal with it after the insurance renewal.",
      "I've been asked to change the minutes after they were agreed in the room. I'm not happy doing it without something in writing. Can you confirm?",
      "If the auditors ask about Wendle, tell them it's a marketing consultancy and leave it there. The fewer people who know the whole picture, the better.",
      "We're hiding this from the board and it's going to come out, {to}. When it does, it's us who'll be asked why the directors were the last to know.",
    ],
    bridgeFormal: [
      'The board was kept in the dark by simple means: verbal updates only, nothing in the board papers or the pack, and the Dunsford discussion taken out of the draft minutes before circulation. Hiding problems from the board in this way left the non-executives, the auditors and the insurers unaware of the size of the hole.',
      "The Company Secretary was told to remove item 9 from the draft minutes so that the trading update read 'in line with budget'. That instruction, from the Chairman, is central to the allegation that problems were hidden from the board.",
      'Hiding problems from the board continued up to the insurance renewal: the NCR tally was kept out of the pack and the renewal form answered no to known circumstances.',
    ],
    bridgeChatty: [
      "We can't keep hiding problems from the board, {to}. Verbal updates, nothing in the pack, item 9 out of the minutes. The non-execs will find out at the insurance renewal or from the auditors.",
      'Geoffrey wants Dunsford kept off the minutes and out of the papers until after the renewal. Hiding that sort of problem from the board is exactly what gets directors disqualified.',
    ],
  },
];

/** Background paragraphs with no bearing on the dispute (noise for search). */
export const NOISE: { subjects: string[]; paragraphs: string[] }[] = [
  {
    subjects: ['Car park resurfacing', 'Car park closure this weekend', 'Parking update'],
    paragraphs: [
      'The staff car park will be closed from Friday evening until Monday morning while the surface is relaid and the bays repainted. Please use the overflow area behind the dispatch yard.',
      "Contractors will be on site from seven on Saturday. Any vehicle left in the main car park after six on Friday may be moved at the owner's expense.",
      'Disabled bays nearest reception will reopen first. Cycle racks are unaffected and the side gate stays open.',
    ],
  },
  {
    subjects: ['Canteen menu', 'Friday lunch', 'New canteen supplier'],
    paragraphs: [
      "This week's specials: leek and potato soup on Monday, shepherd's pie on Wednesday and fish and chips on Friday. The salad bar now runs until half past two.",
      'We are trialling a new coffee machine on the first floor. Please leave feedback on the card by the kettle; the decision will be made at the end of the month.',
      'The canteen will close early on Thursday for a deep clean. Sandwiches can be ordered from reception by ten that morning.',
    ],
  },
  {
    subjects: [
      'IT: password expiry',
      'Scheduled maintenance',
      'Phishing warning',
      'New printer on the second floor',
    ],
    paragraphs: [
      'Network passwords expire every ninety days. You will be prompted at sign-in; choose a passphrase of at least fourteen characters and do not reuse an old one.',
      'The email system will be unavailable between ten and midnight on Sunday for scheduled maintenance. Mobile devices may ask you to sign in again afterwards.',
      'We are seeing messages that pretend to come from a parcel company and ask you to pay a redelivery fee. Do not click the link; forward the message to the IT helpdesk and delete it.',
      'The new multifunction printer by the stairs supports scan-to-email. Badge in at the panel to release your print jobs.',
    ],
  },
  {
    subjects: ['Fire drill', 'Health and safety walk', 'First aid training'],
    paragraphs: [
      'There will be an unannounced fire drill this week. When the alarm sounds, leave by the nearest exit and report to the assembly point at the far end of the yard.',
      'First aid refresher training runs on the second Tuesday of the month. Places are limited to eight; book through your line manager.',
      'The quarterly safety walk found trailing cables in the open-plan office and a blocked fire door by the goods lift. Both have been fixed.',
    ],
  },
  {
    subjects: ['Holiday rota', 'Christmas arrangements', 'Bank holiday cover'],
    paragraphs: [
      'Please add your summer leave to the shared calendar by the end of the month so that cover can be arranged. No more than two people from one team can be off in the same week.',
      'The office will close at noon on Christmas Eve and reopen on the fourth of January. The dispatch team will work a reduced rota between the holidays.',
      'Bank holiday Monday is paid at time and a half for the weekend shift. Swap requests should be agreed with the shift leader.',
    ],
  },
  {
    subjects: ['Charity bake-off', 'Sponsored walk', 'Quiz night'],
    paragraphs: [
      'The annual charity bake-off is on the last Friday of the month. Entries to reception by ten; judging at lunch. All proceeds go to the local hospice.',
      "Thank you to everyone who joined the sponsored walk along the canal. We raised just over two thousand pounds for the children's ward.",
      'Quiz night is back at the Wheatsheaf on Thursday. Teams of up to six; the entry fee goes to the air ambulance.',
    ],
  },
  {
    subjects: ['Meeting room bookings', 'Diary: next week', 'Rescheduled: team meeting'],
    paragraphs: [
      "Could we move Tuesday's team meeting to Wednesday at two? The large meeting room is booked for interviews all of Tuesday morning.",
      'Next week I am out on Monday and Tuesday at the trade show, back in the office from Wednesday. Diary is up to date if anyone needs a slot.',
      'Please remember to release meeting rooms you no longer need. Rooms booked but unused for fifteen minutes will be freed automatically.',
    ],
  },
  {
    subjects: ['Office move', 'New starters', 'Welcome to the team'],
    paragraphs: [
      'Finance will move to the ground floor over the weekend of the twelfth. Please pack your desk into the crates provided and label them with your name and new desk number.',
      'Please welcome our two new starters in customer services, who join us on Monday. They will be shadowing the team for their first fortnight.',
      'Induction packs are available from HR. Every new starter should complete the online safety module in their first week.',
    ],
  },
];
