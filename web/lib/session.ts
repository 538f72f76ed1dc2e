import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, setCsrfToken } from './api-client';

export interface SessionUser {
  id: string;
  login: string;
  displayName: string | null;
  email: string | null;
  avatarUrl: string | null;
}

export interface SessionInfo {
  user: SessionUser | null;
  csrfToken: string | null;
  devTools: boolean;
}

export const sessionKey = ['session'] as const;

export async function getSession(): Promise<SessionInfo> {
  const info = await api<SessionInfo>('/api/v1/session');
  // Every later write carries this session's CSRF token.
  setCsrfToken(info.csrfToken);
  return info;
}

export const sessionQueryOptions = () => queryOptions({ queryKey: sessionKey, queryFn: getSession, staleTime: 60_000 });

export const useSession = () => useQuery(sessionQueryOptions());
