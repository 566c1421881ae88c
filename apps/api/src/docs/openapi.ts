import type { INestApplication } from '@nestjs/common';
import { DocumentBuilder, SwaggerModule, type OpenAPIObject } from '@nestjs/swagger';
import { validationMetadatasToSchemas } from 'class-validator-jsonschema';
import { z } from 'zod';
import { recipeSchema } from '@psiform/contracts';

type Schema = Record<string, unknown>;

/** The recipe as clients send it: converted from the contracts' zod schema (the one parseRecipe checks), not restated. */
export function recipeJsonSchema(): Schema {
  return z.toJSONSchema(recipeSchema, { target: 'openapi-3.0', io: 'input', unrepresentable: 'any' }) as Schema;
}

/** Every property named `recipe` (typed `unknown` in the DTOs: parseRecipe checks it) refers to the Recipe schema. */
function linkRecipes(schemas: Record<string, Schema>): void {
  for (const [name, s] of Object.entries(schemas)) {
    if (name === 'Recipe') continue;
    const props = s.properties as Record<string, Schema> | undefined;
    if (props && 'recipe' in props) props.recipe = { $ref: '#/components/schemas/Recipe' };
  }
}

/**
 * The OpenAPI document of the api, generated from the code rather than written by hand:
 * - routes, methods, path parameters and which DTO class a body or query is: @nestjs/swagger's scan of the controllers;
 * - the DTO classes' schemas: their class-validator rules (the same the ValidationPipe enforces), by
 *   class-validator-jsonschema;
 * - the recipe: the contracts' zod schema through zod's own JSON Schema conversion.
 * Served at /api/docs (and as JSON at /api/docs-json); docs.e2e-spec.ts checks that every route of the app is in it.
 */
export function buildOpenApi(app: INestApplication, version: string): OpenAPIObject {
  const config = new DocumentBuilder()
    .setTitle('Psiform API')
    .setDescription('Print-ready hydrogen-like orbital figures with editorial review. Every route except sign-in and health needs a bearer token (POST /api/auth/login).')
    .setVersion(version)
    .addBearerAuth()
    .build();
  const doc = SwaggerModule.createDocument(app, config, { operationIdFactory: (controller, method) => `${controller.replace(/Controller$/, '')}_${method}` });
  const fromValidators = validationMetadatasToSchemas({ refPointerPrefix: '#/components/schemas/' }) as Record<string, Schema>;
  const schemas: Record<string, Schema> = { ...(doc.components?.schemas as Record<string, Schema> | undefined), ...fromValidators, Recipe: recipeJsonSchema() };
  linkRecipes(schemas);
  doc.components = { ...doc.components, schemas: schemas as NonNullable<OpenAPIObject['components']>['schemas'] };
  doc.security = [{ bearer: [] }];
  return doc;
}

/** Serves the document: the UI at /api/docs, the JSON at /api/docs-json. */
export function serveOpenApi(app: INestApplication, version: string): OpenAPIObject {
  const doc = buildOpenApi(app, version);
  SwaggerModule.setup('docs', app, doc, { useGlobalPrefix: true, jsonDocumentUrl: 'docs-json', yamlDocumentUrl: 'docs-yaml' });
  return doc;
}
