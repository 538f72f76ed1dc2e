/** The side-by-side of a project's campaigns: each fitted the same way and predicted at one temperature. */
import type { Knex } from 'knex';
import { SIGN_CONVENTION } from '../../science';
import { NotFoundError } from '../../lib/errors';
import { Campaign } from '../../models/campaign';
import { Measurement } from '../../models/measurement';
import type { FitResponse } from '../calculators/schemas';
import type { ComparisonResponse } from './analysis-schemas';
import { computeAnalysis } from './analysis';
import { isUuid } from './service';
import { toKelvin } from './schemas';

/** Every campaign of the project fitted (unweighted, 95 %) and predicted at one temperature. */
export async function compareCampaigns(db: Knex, projectId: string, atCelsius: number): Promise<ComparisonResponse> {
  if (!isUuid(projectId)) throw new NotFoundError();
  const atK = toKelvin(atCelsius, 'C');
  const campaigns = await Campaign.query(db).where({ projectId }).orderBy('title').orderBy('id');
  const all = campaigns.length
    ? await Measurement.query(db)
        .whereIn(
          'campaignId',
          campaigns.map((c) => c.id),
        )
        .orderBy('temperatureK')
        .orderBy('createdAt')
        .orderBy('sourceRow')
        .orderBy('id')
    : [];
  const byCampaign = new Map<string, Measurement[]>();
  for (const m of all) {
    const list = byCampaign.get(m.campaignId) ?? [];
    list.push(m);
    byCampaign.set(m.campaignId, list);
  }
  return {
    at: { kelvin: atK, celsius: atCelsius },
    campaigns: campaigns.map((c) => {
      const a = computeAnalysis(c, byCampaign.get(c.id) ?? [], { weighting: 'none', uncertaintyScale: 'absolute', confidence: 0.95, atK });
      const fit = a.fit;
      return {
        id: c.id,
        title: c.title,
        status: c.status,
        n: fit?.n ?? 0,
        ddH: fit ? { 'kJ/mol': fit.ddH['kJ/mol'], 'kcal/mol': fit.ddH['kcal/mol'], se: fit.ddH.se } : null,
        ddS: fit ? { 'J/(mol*K)': fit.ddS['J/(mol*K)'], 'cal/(mol*K)': fit.ddS['cal/(mol*K)'], se: fit.ddS.se } : null,
        prediction: a.at,
        preferred: fit?.twoBranch?.preferred ?? null,
        breakAt: breakAt(fit),
        warnings: fit?.warnings.length ?? 0,
        problem: a.problem,
      };
    }),
    convention: SIGN_CONVENTION,
  };
}

function breakAt(fit: FitResponse | null): ComparisonResponse['campaigns'][number]['breakAt'] {
  const tb = fit?.twoBranch;
  if (!tb?.checked || !tb.claim || !tb.break) return null;
  return { claim: tb.claim, extremum: tb.extremum, kelvin: tb.break.kelvin, celsius: tb.break.celsius };
}
