import { Injectable, NotFoundException } from '@nestjs/common';
import type { AssetLinkDto, UserDto } from '@psiform/contracts';
import { MembershipService } from '../publications/membership.service';
import { AssetStore } from '@psiform/server';
import { attachmentDisposition } from '@psiform/print';
import { downloadName } from './asset-names';

/** Presigned links live this long (short: a link forwarded outside the publication soon stops working). */
export const LINK_TTL_SECONDS = 300;

@Injectable()
export class AssetsService {
  constructor(
    private readonly store: AssetStore,
    private readonly membership: MembershipService,
    private readonly now: () => Date = () => new Date(),
  ) {}

  /**
   * A presigned GET URL for members of the asset's publication (404 for everyone else). The storage answers it
   * as an attachment named from the figure through the publication's file-name template, so a browser saves
   * the file under that name and the app's page stays where it is.
   */
  async link(user: Pick<UserDto, 'id' | 'role'>, id: string): Promise<AssetLinkDto> {
    const asset = await this.store.findById(id);
    if (!asset || !(await this.membership.canAccess(user, asset.publicationId))) throw new NotFoundException(`asset ${id} not found`);
    const facts = await this.store.nameFacts(id);
    const fileName = facts ? downloadName(facts) : `${asset.kind}-${asset.id}`;
    const expiresAt = new Date(this.now().getTime() + LINK_TTL_SECONDS * 1000);
    const url = await this.store.presignGet(asset.storageKey, LINK_TTL_SECONDS, { disposition: attachmentDisposition(fileName) });
    return { url, expiresAt: expiresAt.toISOString(), fileName };
  }
}
