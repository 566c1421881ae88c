import { ForbiddenException, NotFoundException } from '@nestjs/common';
import { MembershipService, guarded, refusalOf } from './membership.service';
import { PublicationsStore, type PublicationEntity, type UserEntity } from '@psiform/server';
import { notUsed } from '../../test/not-used';

const pub = (id: string): PublicationEntity => ({ id, title: id, publisher: 'P', kind: 'book', description: '', lengthUnit: 'angstrom', createdAt: new Date(0) });

class FakeStore extends PublicationsStore {
  pubs = [pub('a'), pub('b')];
  members = new Set(['a|u1']);
  async findById(id: string) {
    return this.pubs.find((p) => p.id === id) ?? null;
  }
  async findAll() {
    return this.pubs;
  }
  async findForMember(userId: string) {
    return this.pubs.filter((p) => this.members.has(`${p.id}|${userId}`));
  }
  insert = notUsed;
  async isMember(publicationId: string, userId: string) {
    return this.members.has(`${publicationId}|${userId}`);
  }
  addMember = notUsed;
  async listMembers(): Promise<UserEntity[]> {
    return [];
  }
  listMembersWithRoles = notUsed;
  async memberRole(publicationId: string, userId: string) {
    return this.members.has(`${publicationId}|${userId}`) ? ('editor' as const) : null;
  }
  membershipsOf = notUsed;
  page = notUsed;
  memberCount = notUsed;
  transaction = notUsed;
}

describe('MembershipService', () => {
  const svc = new MembershipService(new FakeStore());
  const member = { id: 'u1', role: 'illustrator' as const };
  const outsider = { id: 'u2', role: 'editor' as const };
  const admin = { id: 'u9', role: 'admin' as const };

  it('members see their publications only; admins see all', async () => {
    expect((await svc.visiblePublications(member)).map((p) => p.id)).toEqual(['a']);
    expect(await svc.visiblePublications(outsider)).toEqual([]);
    expect((await svc.visiblePublications(admin)).map((p) => p.id)).toEqual(['a', 'b']);
  });

  it('requireAccess answers 404 for non-members and for missing publications', async () => {
    await expect(svc.requireAccess(member, 'a')).resolves.toMatchObject({ id: 'a' });
    await expect(svc.requireAccess(member, 'b')).rejects.toBeInstanceOf(NotFoundException);
    await expect(svc.requireAccess(admin, 'b')).resolves.toMatchObject({ id: 'b' });
    await expect(svc.requireAccess(admin, 'zzz')).rejects.toThrow('publication zzz not found');
  });

  it('roleIn: the membership role for members, admin for admins, null for others', async () => {
    expect(await svc.roleIn(member, 'a')).toBe('editor');
    expect(await svc.roleIn(member, 'b')).toBeNull();
    expect(await svc.roleIn(admin, 'b')).toBe('admin');
  });

  it('canAccess mirrors requireAccess', async () => {
    expect(await svc.canAccess(member, 'a')).toBe(true);
    expect(await svc.canAccess(member, 'b')).toBe(false);
    expect(await svc.canAccess(admin, 'b')).toBe(true);
    expect(await svc.canAccess(admin, 'zzz')).toBe(false);
  });

  describe('authorize: the one table of who may do what', () => {
    const fig = guarded.figure({ id: 'f1', publicationId: 'a', ownerId: 'u1' });
    const store = new FakeStore();
    store.members = new Set(['a|u1', 'a|u3', 'a|u4', 'a|u5']);
    const policy = new MembershipService(store);
    const owner = { id: 'u1', role: 'illustrator' as const };
    const colleague = { id: 'u3', role: 'illustrator' as const };
    const editor = { id: 'u4', role: 'editor' as const };
    const artDirector = { id: 'u5', role: 'art_director' as const };

    it('figures: only the owning illustrator (or an admin) edits; editors export; non-members get 404 first', async () => {
      await expect(policy.authorize(owner, 'figure.edit', fig)).resolves.toBeUndefined();
      await expect(policy.authorize(admin, 'figure.edit', fig)).resolves.toBeUndefined();
      await expect(policy.authorize(colleague, 'figure.edit', fig)).rejects.toThrow(new ForbiddenException("only the figure's owner, or an admin, may change this figure (title or recipe)"));
      await expect(policy.authorize(editor, 'figure.edit', fig)).rejects.toThrow('your role (editor) may not change this figure (title or recipe)');
      await expect(policy.authorize(editor, 'figure.export', fig)).resolves.toBeUndefined();
      await expect(policy.authorize(colleague, 'figure.export', fig)).rejects.toBeInstanceOf(ForbiddenException);
      await expect(policy.authorize(outsider, 'figure.read', fig)).rejects.toThrow(new NotFoundException('figure f1 not found'));
    });

    it("swatchbooks: a publisher's reach every publication of that publisher; only art directors and admins edit", async () => {
      const book = { kind: 'swatchbook' as const, id: 's1', scope: { publisher: 'P' } };
      const elsewhere = { kind: 'swatchbook' as const, id: 's2', scope: { publisher: 'Other' } };
      await expect(policy.authorize(editor, 'swatchbook.read', book)).resolves.toBeUndefined();
      await expect(policy.authorize(artDirector, 'swatchbook.edit', book)).resolves.toBeUndefined();
      await expect(policy.authorize(editor, 'swatchbook.edit', book)).rejects.toBeInstanceOf(ForbiddenException);
      await expect(policy.authorize(artDirector, 'swatchbook.read', elsewhere)).rejects.toBeInstanceOf(NotFoundException);
      expect(MembershipService.reaches({ publisher: 'P' }, { id: 'a', publisher: 'P' })).toBe(true);
      expect(MembershipService.reaches({ publicationId: 'b' }, { id: 'a', publisher: 'P' })).toBe(false);
    });

    it('refusalOf names the rule; admins are never refused', () => {
      expect(refusalOf(admin, 'swatchbook.edit', { kind: 'swatchbook', id: 'x', scope: { publicationId: 'a' } })).toBeNull();
      expect(refusalOf(colleague, 'figure.submit', fig)).toBe("only the figure's owner, or an admin, may submit this figure for review");
    });
  });
});
