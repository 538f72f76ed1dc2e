/**
 * The demo scenario. Everything here is INVENTED for demonstration: the
 * company, the people, the compounds, the catalysts and the numbers.
 */
export const DEMO_COMPANY = 'Kestrelmoor Laboratories (invented demo company)';

export interface DemoIdentity {
  /** Stable id at the local fake OAuth provider. */
  id: string;
  login: string;
  name: string;
  email: string;
  /** What this person does in the story, shown on the fake sign-in page. */
  blurb: string;
}

export const DEMO_IDENTITIES: DemoIdentity[] = [
  { id: '910001', login: 'ada-pemberton', name: 'Ada Pemberton', email: 'ada.pemberton@kestrelmoor.example', blurb: 'Process chemistry lead: owns the demo projects' },
  { id: '910002', login: 'tomas-reyes', name: 'Tomás Reyes', email: 'tomas.reyes@kestrelmoor.example', blurb: 'Bench chemist: edits campaigns and measurements' },
  { id: '910003', login: 'mina-okafor', name: 'Mina Okafor', email: 'mina.okafor@kestrelmoor.example', blurb: 'Analytical QA: reads and downloads only' },
  { id: '910004', login: 'jun-whitlock', name: 'Jun Whitlock', email: 'jun.whitlock@kestrelmoor.example', blurb: 'Works on another project: sees none of the above' },
];
