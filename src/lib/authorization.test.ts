import { describe, expect, it } from 'vitest';
import { permissionsFor } from '@shared/permissions';
import type { MeResponse } from '@shared/schemas/auth';
import { roleOrganizationKind, roles, type Role } from '@shared/vocabulary';
import { guardPortal, homePathFor, landingPathFor, pathAccess } from './authorization';

const ORIGIN = 'https://app.platterpost.example';

function userWith(role: Role): MeResponse {
  return {
    id: '00000000-0000-4000-8000-000000000001',
    email: `${role}@test.example`,
    name: `Test ${role}`,
    role,
    organization: { id: '00000000-0000-4000-8000-000000000002', kind: roleOrganizationKind[role], name: 'Test organisation' },
    permissions: permissionsFor(role),
  };
}

describe('homePathFor', () => {
  it.each([
    ['partner_admin', '/partner/cases'],
    ['partner_staff', '/partner/cases'],
    ['shipping_clerk', '/lab/inbound'],
    ['lab_manager', '/lab/offers'],
    ['lab_technician', '/lab/bench'],
    ['network_admin', '/admin'],
  ] as const)('sends %s to %s', (role, path) => {
    expect(homePathFor(role)).toBe(path);
  });

  it.each(roles)('gives %s a home it is allowed to open, so the guard never loops', (role) => {
    expect(pathAccess(userWith(role), homePathFor(role))).toBe('allowed');
  });
});

describe('pathAccess', () => {
  it('forbids another portal', () => {
    expect(pathAccess(userWith('partner_staff'), '/lab/inbound')).toBe('forbidden');
    expect(pathAccess(userWith('lab_manager'), '/admin')).toBe('forbidden');
  });

  it('forbids a page of the own portal that the role lacks the permission for', () => {
    expect(pathAccess(userWith('partner_staff'), '/partner/earnings')).toBe('forbidden');
    expect(pathAccess(userWith('shipping_clerk'), '/lab/offers')).toBe('forbidden');
    expect(pathAccess(userWith('lab_technician'), '/lab/staff')).toBe('forbidden');
    expect(pathAccess(userWith('lab_technician'), '/lab/earnings')).toBe('forbidden');
  });

  it('allows the pages the role has the permission for, including ones with parameters', () => {
    expect(pathAccess(userWith('partner_admin'), '/partner/settings/webhooks')).toBe('allowed');
    expect(pathAccess(userWith('lab_manager'), '/lab/earnings')).toBe('allowed');
    expect(pathAccess(userWith('partner_staff'), '/partner/cases/PP-7K3M')).toBe('allowed');
    expect(pathAccess(userWith('lab_manager'), '/lab/bench')).toBe('allowed');
  });

  it('allows the profile to every role', () => {
    for (const role of roles) expect(pathAccess(userWith(role), '/profile')).toBe('allowed');
  });

  it('calls a path with no page unknown rather than forbidden', () => {
    expect(pathAccess(userWith('partner_staff'), '/partner/no-such-page')).toBe('unknown');
    expect(pathAccess(userWith('partner_staff'), '/c/some-token')).toBe('unknown');
  });
});

describe('landingPathFor', () => {
  it('follows next when the role may open it, keeping its query and hash', () => {
    expect(landingPathFor(userWith('lab_manager'), '/lab/bench?sort=due#top', ORIGIN)).toBe('/lab/bench?sort=due#top');
  });

  it('goes home when next is a page the role may not open', () => {
    expect(landingPathFor(userWith('partner_staff'), '/admin/settlement', ORIGIN)).toBe('/partner/cases');
    expect(landingPathFor(userWith('shipping_clerk'), '/lab/offers', ORIGIN)).toBe('/lab/inbound');
  });

  it.each(['//evil.example/partner/cases', '/\\evil.example', 'https://evil.example/partner/cases', 'javascript:alert(1)', ''])(
    'refuses %j as a destination and goes home',
    (next) => {
      expect(landingPathFor(userWith('partner_admin'), next, ORIGIN)).toBe('/partner/cases');
    },
  );

  it('goes home without next', () => {
    expect(landingPathFor(userWith('network_admin'), null, ORIGIN)).toBe('/admin');
  });
});

describe('guardPortal', () => {
  const at = (pathname: string, search = '') => ({ pathname, search });

  it('sends a signed-out visitor to sign-in with the page as next', () => {
    expect(guardPortal(null, 'lab', at('/lab/bench', '?case=1'))).toEqual({ redirectTo: '/sign-in?next=%2Flab%2Fbench%3Fcase%3D1' });
  });

  it('leaves next out after a deliberate sign-out', () => {
    expect(guardPortal(null, 'lab', at('/lab/bench'), { offerReturn: false })).toEqual({ redirectTo: '/sign-in' });
  });

  it('sends a person in the wrong portal to their own home', () => {
    expect(guardPortal(userWith('partner_staff'), 'admin', at('/admin'))).toEqual({ redirectTo: '/partner/cases' });
  });

  it('sends a person to their home from a page their role may not open', () => {
    expect(guardPortal(userWith('lab_technician'), 'lab', at('/lab/offers'))).toEqual({ redirectTo: '/lab/bench' });
  });

  it('lets a person through to a page of their portal they may open', () => {
    expect(guardPortal(userWith('shipping_clerk'), 'lab', at('/lab/inbound'))).toBeNull();
    expect(guardPortal(userWith('shipping_clerk'), 'any', at('/profile'))).toBeNull();
  });
});
