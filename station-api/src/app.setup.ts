import { BadRequestException, INestApplication, ValidationError, ValidationPipe } from '@nestjs/common';
import { DocumentBuilder, SwaggerModule } from '@nestjs/swagger';
import compression from 'compression';
import type { Express, Response } from 'express';
import { relative, sep } from 'node:path';
import helmet from 'helmet';
import { ApiExceptionFilter } from './common/filters/http-exception.filter';
import { inspectJsonBodies, parseJsonBodies, refuseControlCharactersInUrl, requireJsonBodies } from './common/http/request-guards';
import { allowedOrigins } from './config/origins';

function flatten(errors: ValidationError[], parent = ''): { field: string; problems: string[] }[] {
  return errors.flatMap((e) => {
    const field = parent ? `${parent}.${e.property}` : e.property;
    const own = e.constraints ? [{ field, problems: Object.values(e.constraints) }] : [];
    return [...own, ...flatten(e.children ?? [], field)];
  });
}

/** Cache lifetime of the UI's hashed build files: a year, the longest HTTP caches honour (RFC 9111 §5.2.2.1 max-age, common practice). */
export const IMMUTABLE_ASSET_CACHE = 'public, max-age=31536000, immutable';
/** index.html and every other unhashed UI file: the browser may keep it but must ask again before each use (RFC 9111 §5.2.2.4). */
export const REVALIDATE_CACHE = 'no-cache';

/**
 * Cache-Control of the static UI (ServeStaticModule's `setHeaders`, also called for the index.html sent for
 * client-side routes). Vite names every file under `assets/` after a hash of its content, so a changed file has
 * a new name and the old one can be kept forever (`immutable`: no revalidation on reload). index.html names
 * the current hashes, so it is revalidated on every visit (`no-cache`; its ETag makes that a 304). Issue 11:
 * the hashed files went out with `max-age=0`.
 */
export function uiCacheHeaders(rootPath: string): (res: Response, filePath: string) => void {
  return (res, filePath) => {
    const hashed = relative(rootPath, filePath).startsWith(`assets${sep}`);
    res.setHeader('Cache-Control', hashed ? IMMUTABLE_ASSET_CACHE : REVALIDATE_CACHE);
  };
}

/** Global pipes, filter, prefix and OpenAPI; used by main.ts and by the e2e tests alike. */
export function configureApp(app: INestApplication, options: { corsOrigins?: string } = {}): void {
  (app.getHttpAdapter().getInstance() as Express).disable('x-powered-by');
  app.use(
    helmet({
      // the station server speaks plain HTTP on the plant network: upgrading would break every asset,
      // and HSTS would pin browsers to an HTTPS port that does not exist
      contentSecurityPolicy: { directives: { upgradeInsecureRequests: null } },
      strictTransportSecurity: false,
    }),
  );
  const origins = allowedOrigins(options.corsOrigins ?? process.env.CORS_ORIGINS ?? '');
  // same origin needs no CORS; only the configured origins get CORS headers
  if (origins.length > 0) app.enableCors({ origin: origins, credentials: false });
  // bodies are parsed and checked here, before Nest's own parser (registered at init) and before the
  // static UI, so malformed bodies are answered in the API's error shape whatever serves the UI
  app.use(refuseControlCharactersInUrl, requireJsonBodies, parseJsonBodies, inspectJsonBodies);
  // gzip for the UI's JS/CSS and the API's JSON. Registered before the routes and the static UI so it wraps
  // both; the default filter leaves PDFs and images alone (already compressed), and socket.io answers on the
  // HTTP server before Express sees the request, so its traffic is untouched.
  app.use(compression());
  app.setGlobalPrefix('api', { exclude: [] });
  app.enableShutdownHooks();
  app.useGlobalPipes(
    new ValidationPipe({
      whitelist: true,
      forbidNonWhitelisted: true,
      transform: true,
      exceptionFactory: (errors) => {
        const details = flatten(errors);
        const message = details
          .map((d) => (d.problems.some((p) => p.includes('should not exist')) ? `Unknown field "${d.field}"` : d.problems.join('; ')))
          .join('; ');
        return new BadRequestException({ message, details });
      },
    }),
  );
  app.useGlobalFilters(new ApiExceptionFilter());
  const doc = new DocumentBuilder()
    .setTitle('Railwright station API')
    .setDescription('End-of-line functional test of DC-DC power modules')
    .setVersion('0.1.0')
    .addBearerAuth()
    .build();
  SwaggerModule.setup('api/docs', app, () => SwaggerModule.createDocument(app, doc), {
    jsonDocumentUrl: 'api/docs/openapi.json',
  });
}
