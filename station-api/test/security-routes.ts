import type { MikroORM } from '@mikro-orm/core';
import { INestApplication, RequestMethod } from '@nestjs/common';
import { METHOD_METADATA, PATH_METADATA } from '@nestjs/common/constants';
import { DiscoveryService, MetadataScanner, ModulesContainer, Reflector } from '@nestjs/core';
import { createHash } from 'node:crypto';
import { IS_PUBLIC_KEY } from '../src/common/decorators/public.decorator';
import { ROLES_KEY } from '../src/common/decorators/roles.decorator';
import type { Role } from '../src/users/user.entity';

/** One controller route as the running application has it. */
export interface AppRoute {
  method: string;
  /** Express path with the global prefix, e.g. /api/stations/:id */
  path: string;
  key: string;
  /** @Roles on the handler, else on the class; undefined when none */
  roles?: Role[];
  isPublic: boolean;
}

const join = (...parts: (string | undefined)[]): string =>
  '/' + parts.filter((p) => p !== undefined && p !== '' && p !== '/').map((p) => p!.replace(/^\/+|\/+$/g, '')).filter(Boolean).join('/');

/**
 * Every controller route of the running application, read with Nest's DiscoveryService and
 * MetadataScanner (the same metadata the router is built from), with its role declaration.
 * Cross-checked against the Express router stack so a route registered some other way is not missed.
 */
export function appRoutes(app: INestApplication): AppRoute[] {
  // the application does not import DiscoveryModule, so the service is built over its module container
  const discovery = new DiscoveryService(app.get(ModulesContainer));
  const scanner = new MetadataScanner();
  const reflector = app.get(Reflector);
  const routes: AppRoute[] = [];
  for (const wrapper of discovery.getControllers()) {
    const instance = wrapper.instance as object | undefined;
    const cls = wrapper.metatype as (new (...a: unknown[]) => object) | undefined;
    if (!instance || !cls) continue;
    const base = Reflect.getMetadata(PATH_METADATA, cls) as string | string[] | undefined;
    for (const name of scanner.getAllMethodNames(Object.getPrototypeOf(instance))) {
      const handler = (instance as Record<string, unknown>)[name] as (...a: unknown[]) => unknown;
      const sub = Reflect.getMetadata(PATH_METADATA, handler) as string | string[] | undefined;
      const verb = Reflect.getMetadata(METHOD_METADATA, handler) as RequestMethod | undefined;
      if (sub === undefined || verb === undefined) continue;
      const method = RequestMethod[verb];
      const roles = reflector.getAllAndOverride<Role[] | undefined>(ROLES_KEY, [handler, cls]);
      const isPublic = reflector.getAllAndOverride<boolean>(IS_PUBLIC_KEY, [handler, cls]) === true;
      for (const b of [base].flat()) {
        for (const s of [sub].flat()) {
          const path = join('api', b, s);
          routes.push({ method, path, key: `${method} ${path}`, roles, isPublic });
        }
      }
    }
  }
  return routes.sort((a, b) => a.key.localeCompare(b.key));
}

/** The Express router's own list of API routes (excluding the OpenAPI document pages). */
export function expressApiRouteKeys(app: INestApplication): string[] {
  const express = app.getHttpAdapter().getInstance() as { router?: { stack: { route?: { path: string; methods: Record<string, boolean> } }[] } };
  const keys: string[] = [];
  for (const layer of express.router?.stack ?? []) {
    // skip the OpenAPI pages and Nest's catch-all not-found route (/api/{*all})
    if (!layer.route || !layer.route.path.startsWith('/api/') || layer.route.path.startsWith('/api/docs') || layer.route.path.includes('{*')) continue;
    for (const [m, on] of Object.entries(layer.route.methods)) if (on && m !== '_all') keys.push(`${m.toUpperCase()} ${layer.route.path}`);
  }
  return [...new Set(keys)].sort();
}

/** Row count and SHA-256 of every table's full contents, ordered by rowid. */
export async function tableFingerprints(orm: MikroORM): Promise<Record<string, string>> {
  const conn = orm.em.getConnection() as unknown as { execute(sql: string): Promise<Record<string, unknown>[]> };
  const tables = await conn.execute("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name");
  const out: Record<string, string> = {};
  for (const { name } of tables) {
    // a WITHOUT ROWID table (run_steps) has no rowid; a plain scan of it comes in primary-key order
    const rows = await conn
      .execute(`select * from "${String(name)}" order by rowid`)
      .catch(() => conn.execute(`select * from "${String(name)}"`));
    out[String(name)] = `${rows.length} rows ${createHash('sha256').update(JSON.stringify(rows)).digest('hex')}`;
  }
  return out;
}

/** Fills path parameters: numbers for ids, a serial that exists or not. */
export function fillPath(path: string, values: { id: string; serial: string }): string {
  return path.replace(/:serial\b/g, values.serial).replace(/:[A-Za-z]+\b/g, values.id);
}
