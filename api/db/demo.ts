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
  {
    id: '910001',
    login: 'ada-pemberton',
    name: 'Ada Pemberton',
    email: 'ada.pemberton@kestrelmoor.example',
    blurb: 'Process chemistry lead: owns the demo projects',
  },
  {
    id: '910002',
    login: 'tomas-reyes',
    name: 'Tomás Reyes',
    email: 'tomas.reyes@kestrelmoor.example',
    blurb: 'Bench chemist: edits campaigns and measurements',
  },
  {
    id: '910003',
    login: 'mina-okafor',
    name: 'Mina Okafor',
    email: 'mina.okafor@kestrelmoor.example',
    blurb: 'Analytical QA: reads and downloads only',
  },
  {
    id: '910004',
    login: 'jun-whitlock',
    name: 'Jun Whitlock',
    email: 'jun.whitlock@kestrelmoor.example',
    blurb: 'Works on another project: sees none of the above',
  },
];

export type DemoRole = 'owner' | 'editor' | 'viewer';

export interface DemoProject {
  /** Fixed ids so the seed is idempotent and later seed steps can find the project. */
  id: string;
  name: string;
  description: string;
  members: { login: string; role: DemoRole }[];
}

export const DEMO_PROJECTS: DemoProject[] = [
  {
    id: '6d1f0c4e-2a51-4c0e-9d7b-0000000a7702',
    name: 'KL-7702 enamide hydrogenation (invented)',
    description:
      'Invented demo: asymmetric hydrogenation of the enamide KL-7702-E to the (S)-amide intermediate with rhodium and the invented ligands Skylark and Merlin (names of birds, like every name in this scenario). Specification for the step: ≥ 99.0 % ee.',
    members: [
      { login: 'ada-pemberton', role: 'owner' },
      { login: 'tomas-reyes', role: 'editor' },
      { login: 'mina-okafor', role: 'viewer' },
    ],
  },
  {
    id: '6d1f0c4e-2a51-4c0e-9d7b-0000000a5120',
    name: 'KL-5120 boron aldol (invented)',
    description:
      'Invented demo: diastereoselective aldol of the invented ketone KL-5120-K with an oxazaborolidine-type promoter. Specification: ≥ 20:1 dr.',
    members: [
      { login: 'jun-whitlock', role: 'owner' },
      { login: 'ada-pemberton', role: 'viewer' },
    ],
  },
];
