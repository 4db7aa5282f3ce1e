import type { QueryClient } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { ROLE_LABELS } from '@shared/roles';
import {
  Badge,
  EmptyState,
  PageHeader,
  QueryBoundary,
  TBody,
  THead,
  Table,
  Td,
  Th,
  Tr,
} from '@/components/ui';
import { useMe } from '@/features/auth/api/get-me';
import { myMattersQueryOptions, useMyMatters } from '@/features/matters/api/get-my-matters';
import { formatDate } from '@/lib/format';

export const clientLoader = (queryClient: QueryClient) => async () => {
  void queryClient.prefetchQuery(myMattersQueryOptions());
  return null;
};

export function MattersRoute() {
  const matters = useMyMatters();
  const me = useMe();
  return (
    <main className="mx-auto max-w-[88rem] px-4 py-6">
      <PageHeader
        title="My matters"
        description="Matters you hold a role on. Each opens to its documents, searches and access."
      />
      <QueryBoundary query={matters} errorTitle="Your matters could not be loaded">
        {({ matters: list }) =>
          list.length === 0 ? (
            <EmptyState title="You are not on any matter yet">
              {me.data?.user.isAdmin
                ? 'As firm admin you can create a matter and appoint its lead on the Firm admin page. You see a matter’s documents only once you are also a member.'
                : 'A matter lead adds you by invitation; the link arrives by e-mail.'}
            </EmptyState>
          ) : (
            <Table caption="Matters you are a member of" data-testid="matters-table">
              <THead>
                <tr>
                  <Th>Matter</Th>
                  <Th className="w-32">Prefix</Th>
                  <Th className="w-36">Your role</Th>
                  <Th className="w-36">Opened</Th>
                </tr>
              </THead>
              <TBody>
                {list.map((matter) => (
                  <Tr key={matter.id}>
                    <Td>
                      <Link
                        to={`/matters/${matter.id}`}
                        className="font-medium text-accent-strong underline-offset-2 hover:underline"
                      >
                        {matter.name}
                      </Link>
                      {matter.description ? (
                        <p className="line-clamp-1 text-[13px] text-ink-muted">
                          {matter.description}
                        </p>
                      ) : null}
                    </Td>
                    <Td className="font-mono text-[13px] text-ink-muted">{matter.controlPrefix}</Td>
                    <Td>
                      <Badge tone={matter.role === 'lead' ? 'accent' : 'neutral'}>
                        {ROLE_LABELS[matter.role]}
                      </Badge>
                    </Td>
                    <Td className="text-ink-muted">{formatDate(matter.createdAt)}</Td>
                  </Tr>
                ))}
              </TBody>
            </Table>
          )
        }
      </QueryBoundary>
    </main>
  );
}
