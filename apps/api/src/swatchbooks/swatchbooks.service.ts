import { BadRequestException, Injectable, NotFoundException } from '@nestjs/common';
import { checkSwatchbook } from '@psiform/colour';
import {
  SWATCHBOOK_FILE_FORMAT,
  type HouseStyleDto,
  type SwatchbookCheckDto,
  type SwatchbookColorsDto,
  type SwatchbookDto,
  type SwatchbookFile,
  type SwatchbookVersionDto,
  type UserDto,
} from '@psiform/contracts';
import { MembershipService, scopeOf, type AccessAction, type Guarded, type Scope } from '../publications/membership.service';
import { SwatchbooksStore, toSwatchbookDto, toSwatchbookVersionDto, type SwatchbookEntity } from '@psiform/server';
import { parseColors, parseName, parseSwatchbookFile } from './swatchbook-input';

type Caller = Pick<UserDto, 'id' | 'role'>;

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

const guardedSwatchbook = (s: SwatchbookEntity): Guarded => ({ kind: 'swatchbook', id: s.id, scope: scopeOf(s), ownerId: s.ownerId });

@Injectable()
export class SwatchbooksService {
  constructor(
    private readonly store: SwatchbooksStore,
    private readonly membership: MembershipService,
  ) {}

  /** Where a new swatchbook goes: `publicationId` (one publication) or `publisher` (all its publications). */
  private async scopeFor(user: Caller, body: { publicationId?: unknown; publisher?: unknown }): Promise<Scope> {
    const hasPub = body.publicationId !== undefined;
    const hasPublisher = body.publisher !== undefined;
    if (hasPub === hasPublisher) throw new BadRequestException(['publicationId: give the publication the swatchbook belongs to (or publisher, for all of one publisher\'s publications), not both']);
    if (hasPub) {
      if (typeof body.publicationId !== 'string' || !UUID.test(body.publicationId)) throw new BadRequestException(['publicationId: must be a UUID']);
      await this.membership.requireAccess(user, body.publicationId);
      return { publicationId: body.publicationId };
    }
    if (typeof body.publisher !== 'string' || !body.publisher.trim() || body.publisher.trim().length > 200) throw new BadRequestException(['publisher: must be 1 to 200 characters']);
    const scope = { publisher: body.publisher.trim() };
    if (!(await this.membership.inScope(user, scope))) throw new NotFoundException(`publisher ${scope.publisher} not found among your publications`);
    return scope;
  }

  private async insert(user: Caller, scope: Scope, name: string, colors: SwatchbookColorsDto, action: 'create' | 'import'): Promise<SwatchbookDto> {
    await this.membership.authorize(user, 'swatchbook.edit', { kind: 'swatchbook', id: '(new)', scope });
    const where = 'publicationId' in scope ? { publicationId: scope.publicationId, publisher: null } : { publicationId: null, publisher: scope.publisher };
    return toSwatchbookDto(await this.store.create({ name, ownerId: user.id, colors, ...where }, action));
  }

  async create(user: Caller, body: { name: unknown; colors: unknown; publicationId?: unknown; publisher?: unknown }): Promise<SwatchbookDto> {
    const name = parseName(body.name);
    const colors = parseColors(body.colors);
    return this.insert(user, await this.scopeFor(user, body), name, colors, 'create');
  }

  async import(user: Caller, body: Record<string, unknown>): Promise<SwatchbookDto> {
    const { publicationId, publisher, ...file } = body;
    const { name, colors } = parseSwatchbookFile(file);
    return this.insert(user, await this.scopeFor(user, { publicationId, publisher }), name, colors, 'import');
  }

  /** The swatchbooks the caller may see; with publicationId, those usable in that publication. */
  async list(user: Caller, publicationId?: string): Promise<SwatchbookDto[]> {
    if (publicationId !== undefined) {
      const pub = await this.membership.requireAccess(user, publicationId);
      return (await this.store.list({ publicationIds: [pub.id], publishers: [pub.publisher] })).map(toSwatchbookDto);
    }
    if (user.role === 'admin') return (await this.store.list('all')).map(toSwatchbookDto);
    const pubs = await this.membership.visiblePublications(user);
    return (await this.store.list({ publicationIds: pubs.map((p) => p.id), publishers: [...new Set(pubs.map((p) => p.publisher))] })).map(toSwatchbookDto);
  }

  /** The swatchbook if the caller may do `action` to it: 404 outside its scope, 403 for a role that may not. */
  async require(user: Caller, id: string, action: AccessAction = 'swatchbook.read'): Promise<SwatchbookEntity> {
    const s = await this.store.findById(id);
    if (!s) throw new NotFoundException(`swatchbook ${id} not found`);
    await this.membership.authorize(user, action, guardedSwatchbook(s));
    return s;
  }

  async get(user: Caller, id: string): Promise<SwatchbookDto> {
    return toSwatchbookDto(await this.require(user, id));
  }

  async update(user: Caller, id: string, body: { name?: unknown; colors?: unknown }): Promise<SwatchbookDto> {
    const current = await this.require(user, id, 'swatchbook.edit');
    const change: { name?: string; colors?: SwatchbookColorsDto } = {};
    if (body.name !== undefined) change.name = parseName(body.name);
    if (body.colors !== undefined) change.colors = parseColors(body.colors, current.colors);
    if (change.name === undefined && change.colors === undefined) throw new BadRequestException(['name or colors is required']);
    const s = await this.store.change(id, change, user.id, 'update', true);
    if (!s) throw new NotFoundException(`swatchbook ${id} not found`);
    return toSwatchbookDto(s);
  }

  async setLocked(user: Caller, id: string, locked: boolean): Promise<SwatchbookDto> {
    await this.require(user, id, 'swatchbook.edit');
    const s = await this.store.change(id, { locked }, user.id, locked ? 'lock' : 'unlock', false);
    if (!s) throw new NotFoundException(`swatchbook ${id} not found`);
    return toSwatchbookDto(s);
  }

  async versions(user: Caller, id: string): Promise<SwatchbookVersionDto[]> {
    await this.require(user, id);
    return (await this.store.versions(id)).map(toSwatchbookVersionDto);
  }

  async exportFile(user: Caller, id: string): Promise<SwatchbookFile> {
    const s = await this.require(user, id);
    return { format: SWATCHBOOK_FILE_FORMAT, formatVersion: 1, name: s.name, colors: s.colors, exportedAt: new Date().toISOString() };
  }

  async checks(user: Caller, id: string): Promise<SwatchbookCheckDto> {
    const s = await this.require(user, id);
    return checkSwatchbook(s.colors) as unknown as SwatchbookCheckDto;
  }

  // ---- house style ----------------------------------------------------------------------------------

  async getHouseStyle(user: Caller, publicationId: string): Promise<HouseStyleDto> {
    await this.membership.requireAccess(user, publicationId);
    const h = await this.store.houseStyle(publicationId);
    if (!h) throw new NotFoundException(`publication ${publicationId} has no house style yet`);
    const s = await this.store.findById(h.swatchbookId);
    if (!s) throw new NotFoundException(`the pinned swatchbook ${h.swatchbookId} no longer exists`);
    return { publicationId, swatchbookId: h.swatchbookId, swatchbookName: s.name, requireColourSignOff: h.requireColourSignOff, allowOverride: h.allowOverride, updatedAt: h.updatedAt.toISOString() };
  }

  async putHouseStyle(user: Caller, publicationId: string, body: { swatchbookId: string; requireColourSignOff?: boolean; allowOverride?: boolean }): Promise<HouseStyleDto> {
    const pub = await this.membership.requireAccess(user, publicationId);
    const s = await this.store.findById(body.swatchbookId);
    // Only a swatchbook of this publication (or of its publisher) may be pinned: another publication's palette
    // would otherwise flow into this one's figures.
    if (!s || !MembershipService.reaches(scopeOf(s), pub)) throw new BadRequestException([`swatchbookId: no swatchbook ${body.swatchbookId} in this publication`]);
    const previous = await this.store.houseStyle(publicationId);
    await this.store.putHouseStyle({
      publicationId,
      swatchbookId: s.id,
      requireColourSignOff: body.requireColourSignOff ?? previous?.requireColourSignOff ?? false,
      allowOverride: body.allowOverride ?? previous?.allowOverride ?? false,
      updatedBy: user.id,
    });
    return this.getHouseStyle(user, publicationId);
  }
}
