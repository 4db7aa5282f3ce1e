import { PrivilegeLogPage } from '@/features/privilege-log/components/privilege-log-page';
import { useMatterId } from './layout';

/** /matters/:matterId/privilege-log */
export function PrivilegeLogRoute() {
  return <PrivilegeLogPage matterId={useMatterId()} />;
}
