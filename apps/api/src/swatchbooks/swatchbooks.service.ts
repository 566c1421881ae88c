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
import { MembershipService } from '../publications/membership.service';
import { SwatchbooksStore, toSwatchbookDto, toSwatchbookVersionDto, type SwatchbookEntity } from '@psiform/server';
import { parseColors, parseName, parseSwatchbookFile } from './swatchbook-input';

type Caller = Pick<UserDto, 'id' | 'role'>;

@Injectable()
export class SwatchbooksService {
  constructor(
    private readonly store: SwatchbooksStore,
    private readonly membership: MembershipService,
  ) {}

  async create(user: Caller, body: { name: unknown; colors: unknown }): Promise<SwatchbookDto> {
    const name = parseName(body.name);
    const colors = parseColors(body.colors);
    return toSwatchbookDto(await this.store.create({ name, ownerId: user.id, colors }, 'create'));
  }

  async import(user: Caller, file: unknown): Promise<SwatchbookDto> {
    const { name, colors } = parseSwatchbookFile(file);
    return toSwatchbookDto(await this.store.create({ name, ownerId: user.id, colors }, 'import'));
  }

  async list(): Promise<SwatchbookDto[]> {
    return (await this.store.list()).map(toSwatchbookDto);
  }

  async require(id: string): Promise<SwatchbookEntity> {
    const s = await this.store.findById(id);
    if (!s) throw new NotFoundException(`swatchbook ${id} not found`);
    return s;
  }

  async get(id: string): Promise<SwatchbookDto> {
    return toSwatchbookDto(await this.require(id));
  }

  async update(user: Caller, id: string, body: { name?: unknown; colors?: unknown }): Promise<SwatchbookDto> {
    const current = await this.require(id);
    const change: { name?: string; colors?: SwatchbookColorsDto } = {};
    if (body.name !== undefined) change.name = parseName(body.name);
    if (body.colors !== undefined) change.colors = parseColors(body.colors, current.colors);
    if (change.name === undefined && change.colors === undefined) throw new BadRequestException(['name or colors is required']);
    const s = await this.store.change(id, change, user.id, 'update', true);
    if (!s) throw new NotFoundException(`swatchbook ${id} not found`);
    return toSwatchbookDto(s);
  }

  async setLocked(user: Caller, id: string, locked: boolean): Promise<SwatchbookDto> {
    const s = await this.store.change(id, { locked }, user.id, locked ? 'lock' : 'unlock', false);
    if (!s) throw new NotFoundException(`swatchbook ${id} not found`);
    return toSwatchbookDto(s);
  }

  async versions(id: string): Promise<SwatchbookVersionDto[]> {
    await this.require(id);
    return (await this.store.versions(id)).map(toSwatchbookVersionDto);
  }

  async exportFile(id: string): Promise<SwatchbookFile> {
    const s = await this.require(id);
    return { format: SWATCHBOOK_FILE_FORMAT, formatVersion: 1, name: s.name, colors: s.colors, exportedAt: new Date().toISOString() };
  }

  async checks(id: string): Promise<SwatchbookCheckDto> {
    const s = await this.require(id);
    return checkSwatchbook(s.colors) as unknown as SwatchbookCheckDto;
  }

  // ---- house style ----------------------------------------------------------------------------------

  async getHouseStyle(user: Caller, publicationId: string): Promise<HouseStyleDto> {
    await this.membership.requireAccess(user, publicationId);
    const h = await this.store.houseStyle(publicationId);
    if (!h) throw new NotFoundException(`publication ${publicationId} has no house style yet`);
    const s = await this.require(h.swatchbookId);
    return { publicationId, swatchbookId: h.swatchbookId, swatchbookName: s.name, requireColourSignOff: h.requireColourSignOff, allowOverride: h.allowOverride, updatedAt: h.updatedAt.toISOString() };
  }

  async putHouseStyle(user: Caller, publicationId: string, body: { swatchbookId: string; requireColourSignOff?: boolean; allowOverride?: boolean }): Promise<HouseStyleDto> {
    await this.membership.requireAccess(user, publicationId);
    const s = await this.store.findById(body.swatchbookId);
    if (!s) throw new BadRequestException([`swatchbookId: no swatchbook ${body.swatchbookId}`]);
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
