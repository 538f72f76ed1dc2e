/**
 * Value sets of the enum-like columns (CHECK constraints in migrations/), shared by the models, the zod schemas and
 * the web. Plain constants only, so the browser may bundle this module through the schemas.
 */
export const projectRoles = ['viewer', 'editor', 'owner'] as const;
export type ProjectRole = (typeof projectRoles)[number];

export const ASSAY_METHODS = ['chiral-hplc', 'chiral-sfc', 'chiral-gc', 'nmr', 'other'] as const;
export type AssayMethod = (typeof ASSAY_METHODS)[number];

export const CAMPAIGN_STATUSES = ['planned', 'active', 'completed', 'archived'] as const;
export type CampaignStatus = (typeof CAMPAIGN_STATUSES)[number];
