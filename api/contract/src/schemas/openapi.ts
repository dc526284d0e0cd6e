import { z } from 'zod';

/** Where a named schema of the contract sits in the OpenAPI document. */
export function schemaRef(id: string): { $ref: string } {
  return { $ref: `#/components/schemas/${id}` };
}

/**
 * Every schema of the contract that has an id (`.meta({ id })`), as OpenAPI 3.0 components: the api adds them to its
 * document so the generated types are the schemas' exact unions. Output shapes: defaults count as present.
 */
export function contractOpenApiSchemas(): Record<string, Record<string, unknown>> {
  const { schemas } = z.toJSONSchema(z.globalRegistry, {
    target: 'openapi-3.0',
    io: 'output',
    uri: (id) => schemaRef(id).$ref,
  });
  return Object.fromEntries(
    Object.entries(schemas).map(([id, schema]) => {
      const { $id: _id, ...rest } = schema as Record<string, unknown>;
      void _id;
      return [id, rest];
    }),
  );
}
