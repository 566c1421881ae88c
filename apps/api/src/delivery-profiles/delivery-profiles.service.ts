import { BadRequestException, Injectable, NotFoundException } from '@nestjs/common';
import {
  DEFAULT_DELIVERY_PROFILE,
  HEX_COLOUR_MESSAGE,
  hexProblem,
  parseDeliveryProfile,
  pressCondition,
  PRESS_CONDITIONS,
  type DeliveryProfile,
  type DeliveryProfileDto,
  type FigurePreflightDto,
  type PressConditionId,
  type UserDto,
} from '@psiform/contracts';
import { isHex } from '@psiform/colour';
import { preflightFailures } from '@psiform/print';
import { MembershipService } from '../publications/membership.service';
import { DeliveryProfilesStore, PreflightReportsStore } from '@psiform/server';
import { checkColours } from './press';

type Caller = Pick<UserDto, 'id' | 'role'>;

/** Delivery profiles (one per publication, set by art directors), press-condition checks and preflight status. */
@Injectable()
export class DeliveryProfilesService {
  constructor(
    private readonly store: DeliveryProfilesStore,
    private readonly reports: PreflightReportsStore,
    private readonly membership: MembershipService,
  ) {}

  async get(user: Caller, publicationId: string): Promise<DeliveryProfileDto> {
    await this.membership.requireAccess(user, publicationId);
    return this.dto(publicationId);
  }

  async put(user: Caller, publicationId: string, body: unknown): Promise<DeliveryProfileDto> {
    await this.membership.requireAccess(user, publicationId);
    const parsed = parseDeliveryProfile(body);
    if (!parsed.ok) throw new BadRequestException(parsed.errors);
    await this.store.save(publicationId, parsed.value, user.id);
    return this.dto(publicationId);
  }

  /** The profile exports are checked against (the publication's, else the default). No access check: callers did it. */
  async profileFor(publicationId: string): Promise<DeliveryProfile> {
    return (await this.store.find(publicationId))?.profile ?? DEFAULT_DELIVERY_PROFILE;
  }

  private async dto(publicationId: string): Promise<DeliveryProfileDto> {
    const row = await this.store.find(publicationId);
    return { publicationId, ...(row?.profile ?? DEFAULT_DELIVERY_PROFILE), isDefault: !row, updatedAt: row?.updatedAt.toISOString() ?? null, updatedBy: row?.updatedBy ?? null };
  }

  pressConditions() {
    return PRESS_CONDITIONS;
  }

  /** CMYK, total ink, ΔE00 round trip and soft-proof colour of each swatch on a press condition (assets/icc). */
  checkPress(id: string, body: unknown) {
    if (!pressCondition(id)) throw new NotFoundException(`press condition ${id} not found; one of ${PRESS_CONDITIONS.map((c) => c.id).join(', ')}`);
    const colours = (body as { colours?: unknown } | null)?.colours;
    if (!colours || typeof colours !== 'object' || Array.isArray(colours)) throw new BadRequestException([`colours: must be an object of name -> colour, each ${HEX_COLOUR_MESSAGE}`]);
    const entries = Object.entries(colours as Record<string, unknown>);
    if (entries.length < 1 || entries.length > 32) throw new BadRequestException(['colours: between 1 and 32 colours']);
    const bad = entries.filter(([, v]) => !isHex(v)).map(([k, v]) => `colours.${k}: ${hexProblem(v)} (got ${JSON.stringify(v)})`);
    if (bad.length) throw new BadRequestException(bad);
    return checkColours(id as PressConditionId, colours as Record<string, string>);
  }

  /** The current version's preflight status (members; 404 otherwise). */
  async figurePreflight(user: Caller, figureId: string, publicationId: string): Promise<FigurePreflightDto> {
    await this.membership.requireAccess(user, publicationId);
    return this.preflightOf(figureId);
  }

  async preflightOf(figureId: string): Promise<FigurePreflightDto> {
    const r = await this.reports.forFigure(figureId);
    if (!r) throw new NotFoundException(`figure ${figureId} not found`);
    const seen = new Set<string>();
    const latest = r.rows.filter((row) => (seen.has(row.kind) ? false : (seen.add(row.kind), true)));
    const failures = latest.flatMap((row) => preflightFailures(row.report).map((f) => `${row.kind} ${f}`));
    return {
      figureId,
      versionNumber: r.versionNumber,
      reports: latest.map((row) => ({ assetId: row.assetId, kind: row.kind, createdAt: row.createdAt.toISOString(), report: row.report })),
      failures,
      blocksApproval: failures.length > 0,
    };
  }
}
