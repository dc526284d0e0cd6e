import { describe, expect, it } from 'vitest';
import { contractOpenApiSchemas, schemaRef } from './openapi';
import './index';

describe('schemaRef', () => {
  it('points into the components of the OpenAPI document', () => {
    expect(schemaRef('SchemeParameters')).toEqual({ $ref: '#/components/schemas/SchemeParameters' });
  });
});

describe('contractOpenApiSchemas', () => {
  const schemas = contractOpenApiSchemas();

  it('publishes every named schema of the contract', () => {
    for (const id of [
      'SchemeParameters',
      'SimpleParameters',
      'MinimizationParameters',
      'AssignmentSchemeRequest',
      'SchemeSettings',
      'DryRunRequest',
      'DryRunResult',
      'CovariateDistribution',
      'ConsentTemplateValues',
      'CreateConsentDraftRequest',
      'RefillConsentDraftRequest',
    ])
      expect(schemas, id).toHaveProperty(id);
  });

  it('refers between schemas by component, and leaves out the registry ids', () => {
    const union = JSON.stringify(schemas.SchemeParameters);
    expect(union).toContain('#/components/schemas/SimpleParameters');
    expect(schemas.SchemeParameters).not.toHaveProperty('$id');
  });

  it('describes output shapes: a field with a default is required', () => {
    const minimization = schemas.MinimizationParameters as { required?: string[] };
    expect(minimization.required).toEqual(expect.arrayContaining(['measure', 'coinProbability']));
  });
});
