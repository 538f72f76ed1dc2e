import { memo, useState } from 'react';
import { useParams } from 'react-router-dom';
import { AfterFirstPaint } from '../../components/ui/after-first-paint';
import { Button } from '../../components/ui/form';
import { Page, Panel, UnreadyPage } from '../../components/ui/page';
import { StaleResult, useLastDefined, worthRetrying } from '../../components/ui/stale';
import { paths } from '../../config/paths';
import { SignedInOnly } from '../../features/auth/components/signed-in-only';
import { Segmented } from '../../components/ui/fields';
import { useAnalysis } from '../../features/campaigns/api/analysis';
import { useCampaign } from '../../features/campaigns/api/campaigns';
import { useMeasurements } from '../../features/campaigns/api/measurements';
import type { CampaignWithRole } from '../../features/campaigns/api/types';
import { CampaignAnalysis } from '../../features/campaigns/components/campaign-analysis';
import { CampaignHeader } from '../../features/campaigns/components/campaign-header';
import { CampaignHistory, KeptFiles, SignOffBar } from '../../features/campaigns/components/campaign-records';
import { ProposedTemperatureForecastPanel, SavedForecasts } from '../../features/campaigns/components/proposed-temperature-forecast';
import { MeasurementGrid } from '../../features/campaigns/components/measurement-grid';
import { ReportMailForm } from '../../features/campaigns/components/report-mail-form';
import { UploadWizard } from '../../features/campaigns/components/upload-wizard';
import { useProject } from '../../features/projects/api/projects';
import { PlannerPanel } from '../../features/plan/components/planner-panel';
import { useCampaignSpecification } from '../../features/plan/api/plan';

const INVENTED = /kestrelmoor|invented/i;

// The two heaviest parts of the page draw again only when their own data change, not each time one
// of the page's other requests (project, saved forecasts, files, history) comes back.
const CampaignAnalysisPart = memo(CampaignAnalysis);
const MeasurementGridPart = memo(MeasurementGrid);

// The panels not read on arrival (forecast, planner, saved forecasts, mail, upload, files, history)
// are built once the browser is idle after the first paint (AfterFirstPaint).

function CampaignBody({ campaign }: { campaign: CampaignWithRole }) {
  const canEdit = campaign.role !== 'viewer';
  // A signed-off campaign keeps its measurements as they are until someone reopens it.
  const canEditRuns = canEdit && !campaign.signOff;
  const [weighting, setWeighting] = useState<'none' | 'uncertainty'>('none');
  const [atCelsius, setAtCelsius] = useState<number | null>(null);
  const measurements = useMeasurements(campaign.id);
  const analysis = useAnalysis(campaign.id, { weighting, atCelsius });
  // A failed reload leaves the last analysis on screen, greyed and labelled stale, with a retry.
  const shownAnalysis = useLastDefined(analysis.data);
  const retryAnalysis = () => void analysis.refetch();
  const specification = useCampaignSpecification(campaign.id);
  const project = useProject(campaign.projectId);
  // The assay SD is in the campaign's measure; it sets the decimals of percentage columns only when that measure is a percentage.
  const assaySd = campaign.measure === 'ee' || campaign.measure === 'percentA' ? campaign.defaultUncertainty : null;
  const invented = [campaign.title, campaign.reactionDescription, campaign.notes, project.data?.name].some((t) => t && INVENTED.test(t));

  return (
    <Page
      title={campaign.title}
      crumbs={[
        { label: 'Projects', to: paths.projects.getHref() },
        { label: project.data?.name ?? 'Project', to: paths.project.getHref(campaign.projectId) },
        { label: campaign.title },
      ]}
      lead={
        <span className="flex flex-wrap items-center gap-x-3 gap-y-1">
          <span>Temperature screen · differential Eyring analysis</span>
          {invented && (
            <span className="rounded border border-slate-400 bg-slate-50 px-1.5 py-0.5 text-xs font-medium text-ink-700">
              ◇ Invented demo data — not real measurements
            </span>
          )}
        </span>
      }
      actions={
        <span className="flex flex-wrap items-center gap-2">
          <a
            className="rounded border border-slate-300 bg-white px-3 py-1.5 text-sm font-medium text-ink-800 hover:bg-slate-50"
            href={paths.campaignReport.getHref(campaign.id)}
            download
          >
            <span aria-hidden="true">⤓ </span>Download spreadsheet report
          </a>
          <a className="text-sm text-fjord-700 underline" href={paths.campaignReportPdf.getHref(campaign.id)} download>
            Summary PDF
          </a>
          <a className="text-sm text-fjord-700 underline" href={paths.campaignMeasurementsCsv.getHref(campaign.id)} download>
            Runs CSV
          </a>
          <a className="text-sm text-fjord-700 underline" href={paths.campaignForecastCsv.getHref(campaign.id)} download>
            Forecast CSV
          </a>
        </span>
      }
    >
      <div className="flex flex-col gap-4">
        <Panel>
          <CampaignHeader campaign={campaign} canEdit={canEdit} />
          <div className="mt-3">
            <SignOffBar campaign={campaign} canEdit={canEdit} />
          </div>
        </Panel>

        <Panel title="Result">
          <div className="mb-3 flex flex-wrap items-end gap-4">
            <Segmented
              legend="Weighting"
              name="weighting"
              value={weighting}
              onChange={setWeighting}
              options={[
                { value: 'none', label: 'None (OLS)' },
                { value: 'uncertainty', label: 'By assay uncertainty' },
              ]}
            />
            {analysis.isFetching && (
              <span className="text-xs text-ink-500" role="status">
                Updating the fit…
              </span>
            )}
          </div>
          {!shownAnalysis && analysis.isPending && <p className="text-sm text-ink-500">Fitting…</p>}
          {!shownAnalysis && analysis.isError && (
            <div role="alert" className="flex flex-wrap items-center gap-2 text-sm text-rose-700">
              The analysis failed: {analysis.error.message}
              {worthRetrying(analysis.error) && (
                <Button onClick={retryAnalysis} disabled={analysis.isFetching}>
                  Try again
                </Button>
              )}
            </div>
          )}
          {shownAnalysis && analysis.isError && (
            <p className="mb-2 text-xs text-rose-700">The analysis could not be brought up to date: {analysis.error.message}</p>
          )}
          {shownAnalysis && measurements.data && (
            <StaleResult
              reason={analysis.isError ? 'failed' : null}
              action="Try again"
              onRetry={worthRetrying(analysis.error) ? retryAnalysis : undefined}
              retrying={analysis.isFetching}
            >
              <CampaignAnalysisPart
                analysis={shownAnalysis}
                measurements={measurements.data}
                stale={analysis.isPlaceholderData}
                measure={campaign.measure}
                specification={specification.data?.effective ?? null}
                assaySd={assaySd}
              />
            </StaleResult>
          )}
        </Panel>

        <Panel title="Forecast at a proposed temperature" belowFirstScreen>
          <AfterFirstPaint>
            <ProposedTemperatureForecastPanel
              campaignId={campaign.id}
              analysis={analysis.isError ? undefined : analysis.data}
              atCelsius={atCelsius}
              onAt={setAtCelsius}
              weighting={weighting}
              canEdit={canEdit}
              measure={campaign.measure}
              failed={analysis.isError}
              onRetry={worthRetrying(analysis.error) ? retryAnalysis : undefined}
              retrying={analysis.isFetching}
            />
          </AfterFirstPaint>
        </Panel>
        <Panel title="Plan the temperature" belowFirstScreen>
          <AfterFirstPaint>
            <PlannerPanel campaignId={campaign.id} projectId={campaign.projectId} canEdit={canEdit} />
          </AfterFirstPaint>
        </Panel>
        <Panel title="Saved forecasts" belowFirstScreen>
          <AfterFirstPaint>
            <SavedForecasts campaignId={campaign.id} canEdit={canEdit} measure={campaign.measure} assaySd={assaySd} />
          </AfterFirstPaint>
        </Panel>
        <Panel title="E-mail the report" belowFirstScreen>
          <AfterFirstPaint>
            <ReportMailForm campaignId={campaign.id} projectId={campaign.projectId} />
          </AfterFirstPaint>
        </Panel>

        <Panel title={`Measurements${measurements.data ? ` (${measurements.data.length})` : ''}`} belowFirstScreen>
          {measurements.isPending && <p className="text-sm text-ink-500">Loading measurements…</p>}
          {measurements.isError && (
            <div role="alert" className="flex flex-wrap items-center gap-2 text-sm text-rose-700">
              The measurements could not be loaded: {measurements.error.message}
              <Button onClick={() => void measurements.refetch()} disabled={measurements.isFetching}>
                Try again
              </Button>
            </div>
          )}
          {measurements.data && <MeasurementGridPart campaign={campaign} measurements={measurements.data} canEdit={canEditRuns} />}
          {!canEdit && (
            <p className="mt-2 text-xs text-ink-600">You are a viewer in this project: you can read and download, not change.</p>
          )}
          {canEdit && campaign.signOff && (
            <p className="mt-2 text-xs text-ink-600">Signed off: reopen the campaign (above) to change its measurements.</p>
          )}
        </Panel>

        {canEditRuns && (
          <Panel title="Upload a file" belowFirstScreen>
            <AfterFirstPaint>
              <UploadWizard campaignId={campaign.id} projectId={campaign.projectId} />
            </AfterFirstPaint>
          </Panel>
        )}

        <Panel title="Uploaded files" belowFirstScreen>
          <AfterFirstPaint>
            <KeptFiles campaignId={campaign.id} />
          </AfterFirstPaint>
        </Panel>

        <Panel title="History" belowFirstScreen>
          <AfterFirstPaint>
            <CampaignHistory campaignId={campaign.id} />
          </AfterFirstPaint>
        </Panel>
      </div>
    </Page>
  );
}

function CampaignPage({ campaignId }: { campaignId: string }) {
  const campaign = useCampaign(campaignId);
  if (!campaign.isSuccess)
    return (
      <UnreadyPage
        query={campaign}
        title="Campaign"
        missingTitle="Campaign not found"
        missing={<p className="text-sm text-ink-600">Either it does not exist or you are not a member of its project.</p>}
      />
    );
  // Keyed, so nothing kept on screen for one campaign (such as its last analysis) carries over to the next.
  return <CampaignBody key={campaign.data.id} campaign={campaign.data} />;
}

export function CampaignRoute() {
  const { campaignId = '' } = useParams();
  return <SignedInOnly title="Campaign">{() => <CampaignPage campaignId={campaignId} />}</SignedInOnly>;
}
