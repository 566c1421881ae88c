import { BadRequestException, Injectable, NotFoundException } from '@nestjs/common';
import { checkSwatchbook } from '@psiform/colour';
import {
  COLOUR_OVERRIDE_ACTION,
  SWATCHBOOK_FILE_FORMAT,
  type HouseStyleDto,
  type HouseStyleImpactDto,
  type HouseStyleImpactFor,
  type SwatchbookCheckDto,
  type SwatchbookColorsDto,
  type SwatchbookDto,
  type SwatchbookFile,
  type SwatchbookVersionDto,
  type UserDto,
} from '@psiform/contracts';
import { MembershipService, scopeOf, type AccessAction, type Guarded, type Scope } from '../publications/membership.service';
import { InvalidInputError, SwatchbooksStore, toSwatchbookDto, toSwatchbookVersionDto, type GateAudits, type HouseStyleOverride, type SwatchbookEntity } from '@psiform/server';
import { decideGate } from '../gates/gate';
import { colourGate, houseStyleImpact } from './house-style-impact';
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
    const view = await this.store.houseStyleView(publicationId);
    if (!view) throw new NotFoundException(`publication ${publicationId} has no house style yet`);
    const { house: h, overrideByName } = view;
    const s = await this.store.findById(h.swatchbookId);
    if (!s) throw new NotFoundException(`the pinned swatchbook ${h.swatchbookId} no longer exists`);
    const colourOverride =
      h.overrideReason !== null && h.overrideAt !== null
        ? { reason: h.overrideReason, byName: overrideByName, at: h.overrideAt.toISOString(), failures: h.overrideFailures ?? [], swatchbookVersion: h.overrideSwatchbookVersion ?? s.version }
        : null;
    return { publicationId, swatchbookId: h.swatchbookId, swatchbookName: s.name, requireColourSignOff: h.requireColourSignOff, allowOverride: h.allowOverride, updatedAt: h.updatedAt.toISOString(), colourOverride };
  }

  /** A swatchbook that may be pinned in this publication (its own, or its publisher's); 400 naming swatchbookId otherwise. */
  private async pinnable(publicationId: string, swatchbookId: string, pub: { id: string; publisher: string }): Promise<SwatchbookEntity> {
    const s = await this.store.findById(swatchbookId);
    // Only a swatchbook of this publication (or of its publisher) may be pinned: another publication's palette
    // would otherwise flow into this one's figures.
    if (!s || !MembershipService.reaches(scopeOf(s), pub)) throw new BadRequestException([`swatchbookId: no swatchbook ${swatchbookId} in this publication`]);
    return s;
  }

  /**
   * Pins or changes the house style. Pinning a swatchbook (the first, or another one) is gated by its colour checks
   * (decideGate): error-level failures answer 409 naming them unless `override: { reason }` comes with the request;
   * the reason is kept on the house style and audited ('colour_override') on it and on every affected figure, in the
   * transaction of the change. Changing only the rules of the pinned swatchbook passes no gate and keeps the
   * override. Every change is audited on the house style ('house_style_pin').
   */
  async putHouseStyle(
    user: Caller,
    publicationId: string,
    body: { swatchbookId: string; requireColourSignOff?: boolean; allowOverride?: boolean; override?: unknown },
  ): Promise<HouseStyleDto> {
    const pub = await this.membership.requireAccess(user, publicationId);
    const s = await this.pinnable(publicationId, body.swatchbookId, pub);
    const previous = await this.store.houseStyle(publicationId);
    const requireColourSignOff = body.requireColourSignOff ?? previous?.requireColourSignOff ?? false;
    const allowOverride = body.allowOverride ?? previous?.allowOverride ?? false;
    const pinning = !previous || previous.swatchbookId !== s.id;
    const gate = colourGate(s.colors);
    const decision = decideGate(gate.name, pinning ? gate.failures : [], body.override);
    const words: string[] = [];
    if (pinning) words.push(`pinned swatchbook "${s.name}" v${s.version}${gate.failures.length ? '' : ' (colour checks pass)'}`);
    if (requireColourSignOff !== (previous?.requireColourSignOff ?? false)) words.push(requireColourSignOff ? 'approval needs a colour sign-off' : 'no colour sign-off needed');
    if (allowOverride !== (previous?.allowOverride ?? false)) words.push(allowOverride ? 'figures may use other colours' : 'figures must use these colours');
    const audits: Required<GateAudits> = { subject: [], figures: [] };
    if (words.length) audits.subject.push({ subjectKind: 'house_style', subjectId: publicationId, actorId: user.id, action: 'house_style_pin', note: words.join('; ') });
    let override: HouseStyleOverride | null | undefined = pinning ? null : undefined;
    if (decision.overridden) {
      const note = `swatchbook "${s.name}" v${s.version} pinned past failing colour checks: ${decision.auditNote}`;
      override = { reason: decision.reason, by: user.id, failures: gate.failures, swatchbookVersion: s.version };
      audits.subject.push({ subjectKind: 'house_style', subjectId: publicationId, actorId: user.id, action: COLOUR_OVERRIDE_ACTION, note });
      for (const f of (await this.figureImpact(publicationId, s, 'pin', allowOverride)).filter((x) => x.affected)) {
        audits.figures.push({ figureId: f.figureId, actorId: user.id, action: COLOUR_OVERRIDE_ACTION, fromStatus: f.status, toStatus: f.status, note });
      }
    }
    await this.store.putHouseStyle({ publicationId, swatchbookId: s.id, requireColourSignOff, allowOverride, updatedBy: user.id }, { override, audits });
    return this.getHouseStyle(user, publicationId);
  }

  /**
   * What pinning a swatchbook (`pin`; default the pinned one) or a batch re-render with the pinned one (`rerender`)
   * would do: the gate's verdict and every figure of the publication. Read-only: the confirmation before the change.
   */
  async impact(user: Caller, publicationId: string, mode: HouseStyleImpactFor, swatchbookId?: string): Promise<HouseStyleImpactDto> {
    const pub = await this.membership.requireAccess(user, publicationId);
    const house = await this.store.houseStyle(publicationId);
    if (mode === 'rerender' && swatchbookId !== undefined && swatchbookId !== house?.swatchbookId) {
      throw new InvalidInputError(['swatchbookId: a batch re-render uses the pinned swatchbook; leave swatchbookId out']);
    }
    const id = swatchbookId ?? house?.swatchbookId;
    if (!id) throw new InvalidInputError(['swatchbookId: required while the publication has no house style']);
    const s = await this.pinnable(publicationId, id, pub);
    const allowOverride = house?.allowOverride ?? false;
    return {
      publicationId,
      for: mode,
      swatchbook: { id: s.id, name: s.name, version: s.version },
      gate: colourGate(s.colors),
      figures: await this.figureImpact(publicationId, s, mode, allowOverride),
    };
  }

  private async figureImpact(publicationId: string, s: SwatchbookEntity, mode: HouseStyleImpactFor, allowOverride: boolean) {
    const rows = await this.store.figuresWithCurrentVersion(publicationId);
    return houseStyleImpact(rows.map(({ figure, version }) => ({ figure, recipe: version.recipe })), s, mode, { allowOverride });
  }
}
