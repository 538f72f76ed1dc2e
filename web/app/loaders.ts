/**
 * Route loaders: at navigation, before the page's code has arrived, start every request the page
 * makes on mount, all at once, through the same query options the page's hooks use; the page then
 * finds them in the query cache (in flight or answered). Without this a campaign asked for the
 * session, then the campaign, then its runs and analysis, each waiting for the one before.
 *
 * The loaders never wait and never fail: the pages keep their own loading and error states, and a
 * request that fails here is simply asked again by the page's hook. Query modules that carry
 * response schemas are imported on demand, so the first page's JavaScript does not grow.
 */
import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { sessionQueryOptions } from '../lib/session';
import { campaignQueryOptions, campaignsQueryOptions } from '../features/campaigns/api/campaigns';
import { measurementsQueryOptions } from '../features/campaigns/api/measurements';
import { analysisQueryOptions } from '../features/campaigns/api/analysis';
import { projectQueryOptions } from '../features/projects/api/projects';
import { campaignPlanQueryOptions, campaignSpecificationQueryOptions } from '../features/plan/api/stored';

/** The analysis the campaign page opens with: unweighted, no extra temperature. */
export const OPENING_ANALYSIS = { weighting: 'none', atCelsius: null } as const;

const quietly = (work: Promise<unknown>) => void work.catch(() => undefined);

export function projectLoader(client: QueryClient) {
  return ({ params }: LoaderFunctionArgs) => {
    const projectId = params.projectId ?? '';
    void client.prefetchQuery(sessionQueryOptions());
    void client.prefetchQuery(projectQueryOptions(projectId));
    void client.prefetchQuery(campaignsQueryOptions(projectId));
    quietly(
      import('../features/campaigns/api/comparison').then(({ comparisonQueryOptions, OPENING_COMPARISON_CELSIUS }) =>
        client.prefetchQuery(comparisonQueryOptions(projectId, OPENING_COMPARISON_CELSIUS)),
      ),
    );
    return null;
  };
}

export function campaignLoader(client: QueryClient) {
  return ({ params }: LoaderFunctionArgs) => {
    const campaignId = params.campaignId ?? '';
    void client.prefetchQuery(sessionQueryOptions());
    // The campaign names its project, which the page's breadcrumbs ask for.
    quietly(
      client
        .ensureQueryData(campaignQueryOptions(campaignId))
        .then((campaign) => client.prefetchQuery(projectQueryOptions(campaign.projectId))),
    );
    // The analysis first: it is the largest answer and the one the page is read for. Its query
    // module carries no schema (the check loads beside the request), so it starts at once.
    void client.prefetchQuery(analysisQueryOptions(campaignId, OPENING_ANALYSIS));
    void client.prefetchQuery(measurementsQueryOptions(campaignId));
    // The stored specification (drawn on the charts) and the planner's stored plan: at once too, so
    // the charts are first drawn with the specification rather than drawn again when it arrives.
    void client.prefetchQuery(campaignSpecificationQueryOptions(campaignId));
    void client.prefetchQuery(campaignPlanQueryOptions(campaignId));
    return null;
  };
}

export function compareLoader(client: QueryClient) {
  return ({ params }: LoaderFunctionArgs) => {
    void client.prefetchQuery(sessionQueryOptions());
    void client.prefetchQuery(campaignsQueryOptions(params.projectId ?? ''));
    return null;
  };
}

export function comparisonLoader(client: QueryClient) {
  return ({ params }: LoaderFunctionArgs) => {
    void client.prefetchQuery(sessionQueryOptions());
    quietly(
      import('../features/plan/api/plan').then(({ comparisonQueryOptions }) =>
        client.prefetchQuery(comparisonQueryOptions(params.comparisonId ?? '')),
      ),
    );
    return null;
  };
}
