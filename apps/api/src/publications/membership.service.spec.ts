import { NotFoundException } from '@nestjs/common';
import { MembershipService } from './membership.service';
import { PublicationsStore, type NewPublication, type PublicationEntity, type UserEntity } from '@psiform/server';

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
  async insert(_: NewPublication): Promise<PublicationEntity> {
    throw new Error('not used');
  }
  async isMember(publicationId: string, userId: string) {
    return this.members.has(`${publicationId}|${userId}`);
  }
  async addMember(): Promise<boolean> {
    throw new Error('not used');
  }
  async listMembers(): Promise<UserEntity[]> {
    return [];
  }
  async listMembersWithRoles(): Promise<never> {
    throw new Error('not used');
  }
  async memberRole(publicationId: string, userId: string) {
    return this.members.has(`${publicationId}|${userId}`) ? ('editor' as const) : null;
  }
  async membershipsOf(): Promise<never> {
    throw new Error('not used');
  }
  async page(): Promise<never> {
    throw new Error('not used');
  }
  async memberCount(): Promise<never> {
    throw new Error('not used');
  }
  async transaction(): Promise<never> {
    throw new Error('not used');
  }
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
});
