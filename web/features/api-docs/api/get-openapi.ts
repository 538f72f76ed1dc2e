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

export interface OpenApiOperation {
  summary?: string;
  description?: string;
  tags?: string[];
  requestBody?: { content: Record<string, { schema: OpenApiSchema }> };
  responses: Record<string, { description: string; content?: Record<string, { schema: OpenApiSchema }> }>;
}

export interface OpenApiDocument {
  info: { title: string; version: string; description?: string };
  paths: Record<string, Record<string, OpenApiOperation>>;
  components?: { schemas?: Record<string, OpenApiSchema> };
}

export const getOpenApi = () => api<OpenApiDocument>('/api/v1/openapi.json');

export const openApiQueryOptions = () => queryOptions({ queryKey: ['openapi'], queryFn: getOpenApi, staleTime: Infinity });

export const useOpenApi = () => useQuery(openApiQueryOptions());
