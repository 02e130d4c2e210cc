import { describe, expect, it } from 'vitest';
import { can, PERMISSIONS, ROLES, type Permission } from '@shared/auth/permissions';
import { authKeys, Authorization } from '@/lib/authorization';
import { createQueryClient } from '@/lib/query-client';
import { renderWithQueryClient } from '../setup/client';

describe('<Authorization>', () => {
  const permissions = Object.keys(PERMISSIONS) as Permission[];

  it.each(ROLES)('shows exactly what can() allows for %s', (role) => {
    const queryClient = createQueryClient();
    queryClient.setQueryData(authKeys.me(), { id: 1, email: `${role}@example.org`, name: role, role });
    const { container } = renderWithQueryClient(
      <>
        {permissions.map((permission) => (
          <Authorization
            key={permission}
            permission={permission}
            forbiddenFallback={<i data-denied={permission} />}
          >
            <b data-allowed={permission} />
          </Authorization>
        ))}
      </>,
      queryClient,
    );
    const allowed = [...container.querySelectorAll('[data-allowed]')].map((e) =>
      e.getAttribute('data-allowed'),
    );
    const denied = [...container.querySelectorAll('[data-denied]')].map((e) => e.getAttribute('data-denied'));
    expect(allowed).toEqual(permissions.filter((p) => can({ role }, p)));
    expect(denied).toEqual(permissions.filter((p) => !can({ role }, p)));
    expect(allowed.length + denied.length).toBe(permissions.length);
  });

  it('shows nothing protected when nobody is signed in', () => {
    const queryClient = createQueryClient();
    queryClient.setQueryData(authKeys.me(), null);
    const { container } = renderWithQueryClient(
      <Authorization permission="read">
        <b data-allowed="read" />
      </Authorization>,
      queryClient,
    );
    expect(container.querySelector('[data-allowed]')).toBeNull();
  });
});
