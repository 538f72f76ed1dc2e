/** The benchmarks' synthetic screen (not demo data), shared so the analysis and page benches load the same runs. */
import type { Knex } from 'knex';

/**
 * Insert `runs` synthetic ee runs into a campaign: 40 temperatures from −80 to +37 °C, ln r = 1200/T − 1.2 with a
 * deterministic scatter of a few hundredths, an assay SD of 0.3 % ee.
 */
export async function insertSyntheticRuns(knex: Knex, campaignId: string, userId: string, runs: number): Promise<void> {
  const rows = Array.from({ length: runs }, (_, i) => {
    const temperatureK = 193.15 + (i % 40) * 3;
    const lnR = 1200 / temperatureK - 1.2 + 0.04 * Math.sin(i * 0.91);
    return {
      campaignId,
      temperatureK,
      measure: 'ee',
      value: Math.round(10000 * Math.tanh(lnR / 2)) / 100,
      uncertainty: 0.3,
      createdByUserId: userId,
    };
  });
  for (let i = 0; i < rows.length; i += 500) await knex('measurements').insert(rows.slice(i, i + 500));
}

/** A project owned by `userId` holding one open ee campaign of `runs` synthetic runs; the caller deletes the project. */
export async function insertSyntheticScreen(
  knex: Knex,
  userId: string,
  names: { project: string; campaign: string },
  runs: number,
): Promise<{ projectId: string; campaignId: string }> {
  const [project] = await knex('projects')
    .insert({ name: names.project, description: 'Synthetic load, not demo data.', createdBy: userId })
    .returning('id');
  await knex('projectMembers').insert({ projectId: project.id, userId, role: 'owner' });
  const [campaign] = await knex('campaigns')
    .insert({
      projectId: project.id,
      title: names.campaign,
      productNameA: 'A',
      productNameB: 'B',
      measure: 'ee',
      assayMethod: 'chiral-hplc',
      defaultUncertainty: 0.3,
      status: 'active',
    })
    .returning('id');
  await insertSyntheticRuns(knex, campaign.id, userId, runs);
  return { projectId: project.id, campaignId: campaign.id };
}
