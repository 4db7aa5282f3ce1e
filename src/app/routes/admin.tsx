import type { QueryClient } from '@tanstack/react-query';
import { Notice, PageHeader } from '@/components/ui';
import { usersQueryOptions } from '@/features/admin/api/get-users';
import { adminMattersQueryOptions } from '@/features/admin/api/get-admin-matters';
import { useMe } from '@/features/auth/api/get-me';
import { AccountsSection } from '@/features/admin/components/accounts-section';
import { MattersSection } from '@/features/admin/components/matters-section';

export const clientLoader = (queryClient: QueryClient) => async () => {
  void queryClient.prefetchQuery(usersQueryOptions());
  void queryClient.prefetchQuery(adminMattersQueryOptions());
  return null;
};

export function AdminRoute() {
  const me = useMe();
  if (me.data && !me.data.user.isAdmin) {
    return (
      <main className="mx-auto max-w-[88rem] px-4 py-6">
        <Notice tone="warn" title="Firm admins only">
          This page is for the firm's administrators, who create accounts and matters.
        </Notice>
      </main>
    );
  }
  return (
    <main className="mx-auto max-w-[88rem] px-4 py-6" data-testid="admin-page">
      <PageHeader
        title="Firm admin"
        description="Create accounts and matters and appoint each matter's lead. Admins see no documents unless they are also members of a matter."
      />
      <div className="space-y-8">
        <MattersSection />
        <AccountsSection />
      </div>
    </main>
  );
}
