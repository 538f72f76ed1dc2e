import type { OpenApiRegistrar } from '../../lib/openapi';
import { registerCompute } from '../compute/openapi';

/** Every feature that documents its routes in the OpenAPI description adds its registrar here. */
export const openApiRegistrars: OpenApiRegistrar[] = [registerCompute];
