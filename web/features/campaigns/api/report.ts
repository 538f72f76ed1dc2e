import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export interface ReportMailBody {
  recipients: string[];
  message?: string;
  attach?: ('xlsx' | 'pdf')[];
  /** Temperature (°C) the report forecasts at; omitted → the newest saved forecast. */
  at?: number;
}

export interface ReportMailResult {
  sentTo: { userId: string; email: string }[];
  attachments: string[];
}

export const sendReport = (campaignId: string, body: ReportMailBody) =>
  api<ReportMailResult>(`/api/v1/campaigns/${campaignId}/report/email`, { method: 'POST', body });
export const useSendReport = (campaignId: string) => useMutation({ mutationFn: (body: ReportMailBody) => sendReport(campaignId, body) });
