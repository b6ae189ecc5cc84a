import { EntityManager } from '@mikro-orm/sqlite';
import { ConflictException, ForbiddenException, Injectable, NotFoundException } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { Fixture } from '../fixtures/fixture.entity';
import { FixturesService, toFixtureDto } from '../fixtures/fixtures.service';
import { LotState } from '../lots/lot.entity';
import { LotsService } from '../lots/lots.service';
import type { CreateStationDto, StationDto, StationState, UpdateStationDto } from './dto/station.dto';
import type { Role } from '../users/user.entity';
import { Station } from './station.entity';
import { staticBlockReasons } from './station-readiness';

/** Live state of a station as the run engine knows it; plugged in by the runs feature. */
export type StationStatusSource = (
  station: Station,
) => Promise<{ state: StationState; reasons: string[] } | undefined> | { state: StationState; reasons: string[] } | undefined;

/** Roles that may assign or clear a station's fixture (docs/security.md). */
export const FIXTURE_ASSIGNERS: readonly Role[] = ['engineer', 'admin'];

@Injectable()
export class StationsService {
  private statusSource?: StationStatusSource;

  constructor(
    private readonly em: EntityManager,
    private readonly audit: AuditService,
    private readonly fixtures: FixturesService,
    private readonly lots: LotsService,
  ) {}

  /**
   * Lets the runs feature supply live state (testing, fault, ...) for GET /api/stations without this
   * feature depending on it. Without a source, state comes from master data alone: blocked or idle.
   */
  useStatusSource(source: StationStatusSource): void {
    this.statusSource = source;
  }

  /** The API view of a station; expects fixture and activeLot.product loaded. */
  async toDto(s: Station, now = new Date()): Promise<StationDto> {
    const staticReasons = staticBlockReasons(s, now);
    const live = await this.statusSource?.(s);
    const lot = s.activeLot;
    return {
      id: s.id,
      code: s.code,
      name: s.name,
      location: s.location ?? null,
      active: s.active,
      fixture: s.fixture ? toFixtureDto(s.fixture, now) : null,
      activeLot: lot
        ? { id: lot.id, code: lot.code, state: lot.state, plannedQuantity: lot.plannedQuantity, productId: lot.product.id, partNumber: lot.product.partNumber }
        : null,
      state: live?.state ?? (staticReasons.length ? 'blocked' : 'idle'),
      reasons: live?.reasons ?? staticReasons,
    };
  }

  async list(): Promise<StationDto[]> {
    const stations = await this.em.find(Station, {}, { populate: ['fixture', 'activeLot.product'], orderBy: { code: 'asc' } });
    return Promise.all(stations.map((s) => this.toDto(s)));
  }

  async getEntity(id: number): Promise<Station> {
    const s = await this.em.findOne(Station, { id }, { populate: ['fixture', 'activeLot.product'] });
    if (!s) throw new NotFoundException({ message: `There is no station with id ${id}.`, details: { code: 'unknown_station' } });
    return s;
  }

  async get(id: number): Promise<StationDto> {
    return this.toDto(await this.getEntity(id));
  }

  async create(dto: CreateStationDto, actor: AuthUser): Promise<StationDto> {
    if (await this.em.count(Station, { code: dto.code })) {
      throw new ConflictException({ message: `A station with code ${dto.code} already exists.`, details: { code: 'station_code_taken' } });
    }
    const fixture = dto.fixtureId ? await this.assignableFixture(dto.fixtureId, undefined) : undefined;
    const id = await this.em.transactional(async (em) => {
      const s = em.create(Station, { code: dto.code, name: dto.name.trim(), location: dto.location?.trim() || undefined, fixture, active: true }, { partial: true });
      await em.flush();
      await this.audit.record({ actor: actor.id, action: 'station.created', entityType: 'station', entityId: s.id, after: summary(s) }, em);
      return s.id;
    });
    return this.get(id);
  }

  /** Sets or clears the active lot (must be open) and the fixture (active, not held by another station). */
  async update(id: number, dto: UpdateStationDto, actor: AuthUser): Promise<StationDto> {
    // quality may set the station's lot, but moving fixtures between stations is an engineering change
    if (dto.fixtureId !== undefined && !FIXTURE_ASSIGNERS.some((r) => actor.roles.includes(r))) {
      throw new ForbiddenException({
        message: `Only ${FIXTURE_ASSIGNERS.join(' or ')} may change a station's fixture; you are signed in as ${actor.roles.join(', ')}.`,
        details: { code: 'missing_role', required: FIXTURE_ASSIGNERS },
      });
    }
    const s = await this.getEntity(id);
    const before = summary(s);
    if (dto.activeLotId !== undefined) {
      if (dto.activeLotId === null) s.activeLot = undefined;
      else {
        const lot = await this.lots.getEntity(dto.activeLotId);
        if (lot.state !== LotState.Open) {
          throw new ConflictException({
            message: `Lot ${lot.code} is ${lot.state.replace('_', ' ')}; only an open lot can be tested. Choose an open lot.`,
            details: { code: 'lot_not_open', lotState: lot.state },
          });
        }
        s.activeLot = lot;
      }
    }
    if (dto.fixtureId !== undefined) {
      s.fixture = dto.fixtureId === null ? undefined : await this.assignableFixture(dto.fixtureId, s.id);
    }
    const after = summary(s);
    if (changed(before, after)) await this.audit.record({ actor: actor.id, action: 'station.updated', entityType: 'station', entityId: s.id, before, after }, this.em);
    await this.em.flush();
    return this.toDto(s);
  }

  private async assignableFixture(fixtureId: number, stationId: number | undefined): Promise<Fixture> {
    const f = await this.fixtures.getEntity(fixtureId);
    if (!f.active) {
      throw new ConflictException({ message: `Fixture ${f.code} is out of service; put it back in service first.`, details: { code: 'fixture_inactive' } });
    }
    const holder = await this.em.findOne(Station, { fixture: f.id, ...(stationId ? { id: { $ne: stationId } } : {}) });
    if (holder) {
      throw new ConflictException({
        message: `Fixture ${f.code} is already on station ${holder.code}. Remove it there first.`,
        details: { code: 'fixture_in_use', stationCode: holder.code },
      });
    }
    return f;
  }
}

/** A PATCH that sets what is already there is not worth an audit line. */
function changed(before: object, after: object): boolean {
  return JSON.stringify(before) !== JSON.stringify(after);
}

function summary(s: Station): Record<string, unknown> {
  return {
    code: s.code,
    name: s.name,
    fixtureId: s.fixture?.id ?? null,
    fixtureCode: s.fixture?.code ?? null,
    activeLotId: s.activeLot?.id ?? null,
    activeLotCode: s.activeLot?.code ?? null,
  };
}
