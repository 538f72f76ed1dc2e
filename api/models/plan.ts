import objection from 'objection';

/** A specification: the project's default (campaignId null) or one campaign's override. */
export class PlanSpecification extends objection.Model {
  static override tableName = 'plan_specifications';

  declare id: string;
  declare projectId: string;
  declare campaignId: string | null;
  declare measure: 'ee' | 'er' | 'dr' | 'percentA';
  declare minimum: number;
  declare probability: number;
  declare runs: number;
  declare version: number;
  declare updatedByUserId: string | null;
  declare createdAt: Date;
  declare updatedAt: Date;
}

/** A campaign's stored plan: the inputs and the planner's answer when it was saved. */
export class CampaignPlan extends objection.Model {
  static override tableName = 'campaign_plans';
  static override idColumn = 'campaignId';
  static override jsonAttributes = ['inputs', 'result'];

  declare campaignId: string;
  declare inputs: Record<string, unknown>;
  declare result: Record<string, unknown>;
  declare version: number;
  declare updatedByUserId: string | null;
  declare createdAt: Date;
  declare updatedAt: Date;
}

/** A saved comparison of 2–6 campaigns at one temperature, shared with its project's members. */
export class Comparison extends objection.Model {
  static override tableName = 'comparisons';

  declare id: string;
  declare projectId: string;
  declare name: string;
  declare campaignIds: string[];
  declare temperatureK: number;
  declare createdByUserId: string | null;
  declare createdAt: Date;
}
