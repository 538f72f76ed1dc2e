import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export interface OpenApiSchema {
  $ref?: string;
  type?: string | string[];
  description?: string;
  properties?: Record<string, OpenApiSchema>;
  required?: string[];
  items?: OpenApiSchema;
  enum?: unknown[];
  const?: unknown;
  anyOf?: OpenApiSchema[];
  oneOf?: OpenApiSchema[];
  prefixItems?: OpenApiSchema[];
  default?: unknown;
  minimum?: number;
  maximum?: number;
  exclusiveMinimum?: number;
  exclusiveMaximum?: number;
  minItems?: number;
  maxItems?: number;
}

export interface OpenApiParameter {
  name: string;
  in: 'path' | 'query' | 'header' | 'cookie';
  required?: boolean;
  description?: string;
  schema?: OpenApiSchema;
}

export interface OpenApiResponse {
  description: string;
  content?: Record<string, { schema: OpenApiSchema }>;
}

export interface OpenApiOperation {
  operationId?: string;
  summary?: string;
  description?: string;
  tags?: string[];
  parameters?: OpenApiParameter[];
  /** Alternatives (any one will do); within one, every scheme named is needed. An empty one: no credentials. */
  security?: Record<string, string[]>[];
  requestBody?: { content: Record<string, { schema: OpenApiSchema }> };
  responses: Record<string, OpenApiResponse>;
}

export interface OpenApiSecurityScheme {
  type: string;
  in?: string;
  name?: string;
  scheme?: string;
  description?: string;
}

/** One entry of the server's problem-type registry, as the document lists it. */
export interface ProblemTypeEntry {
  type: string;
  status: number;
  title: string;
  description: string;
}

export interface OpenApiDocument {
  info: { title: string; version: string; description?: string };
  paths: Record<string, Record<string, OpenApiOperation>>;
  components?: { schemas?: Record<string, OpenApiSchema>; securitySchemes?: Record<string, OpenApiSecurityScheme> };
  'x-problem-types'?: ProblemTypeEntry[];
}

export const getOpenApi = () => api<OpenApiDocument>('/api/v1/openapi.json');

export const openApiQueryOptions = () => queryOptions({ queryKey: ['openapi'], queryFn: getOpenApi, staleTime: Infinity });

export const useOpenApi = () => useQuery(openApiQueryOptions());
